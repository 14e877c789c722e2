// A local SMTP server for development and tests: accepts every message on loopback, keeps it
// parsed in memory, and lists it over a tiny HTTP endpoint. It never relays anything anywhere.
//
//   node --import tsx server/fakes/smtp.ts        (SMTP_FAKE_PORT=2525, SMTP_FAKE_HTTP_PORT=2526)
//   GET http://127.0.0.1:2526/messages             → [{ id, from, to, subject, date, text, attachments }]
//   GET http://127.0.0.1:2526/messages/:id/attachments/:index → the attachment's bytes
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

export interface FakeAttachment {
  filename: string;
  contentType: string;
  content: Buffer;
}

export interface FakeMessage {
  id: number;
  from: string;
  to: string[];
  subject: string;
  date: string;
  text: string;
  html: string | null;
  attachments: FakeAttachment[];
}

export interface FakeSmtp {
  smtpPort: number;
  httpPort: number | null;
  /** Received messages, oldest first. */
  messages(): FakeMessage[];
  /** Resolves with the first received message matching `predicate` (waiting for it if needed). */
  waitFor(predicate: (m: FakeMessage) => boolean, timeoutMs?: number): Promise<FakeMessage>;
  clear(): void;
  close(): Promise<void>;
}

const HOST = '127.0.0.1';
/** Anything larger is refused: nothing the app sends comes close. */
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

function listen(server: { listen(port: number, host: string, cb: () => void): unknown; once(e: 'error', cb: (err: Error) => void): unknown }, port: number) {
  return new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, HOST, () => resolve());
  });
}

/** Starts the fake on loopback. Port 0 picks a free port; the chosen ports are returned. */
export async function startFakeSmtp(options: { smtpPort: number; httpPort?: number }): Promise<FakeSmtp> {
  const received: FakeMessage[] = [];
  const waiters: { predicate: (m: FakeMessage) => boolean; resolve: (m: FakeMessage) => void }[] = [];
  let nextId = 1;

  const smtp = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: 'Tractwise local SMTP fake',
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const toField = parsed.to ? (Array.isArray(parsed.to) ? parsed.to : [parsed.to]) : [];
          const message: FakeMessage = {
            id: nextId++,
            from: parsed.from?.text ?? String(session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: toField.flatMap((a) => a.value.map((v) => v.address ?? '')).filter(Boolean),
            subject: parsed.subject ?? '',
            date: (parsed.date ?? new Date()).toISOString(),
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
            attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? '', contentType: a.contentType, content: a.content })),
          };
          received.push(message);
          for (const w of [...waiters]) {
            if (w.predicate(message)) {
              waiters.splice(waiters.indexOf(w), 1);
              w.resolve(message);
            }
          }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await listen(smtp as unknown as Parameters<typeof listen>[0], options.smtpPort);
  const smtpPort = (smtp.server.address() as AddressInfo).port;

  let httpServer: http.Server | null = null;
  if (options.httpPort !== undefined) {
    httpServer = http.createServer((req, res) => {
      const url = new URL(req.url ?? '/', `http://${HOST}`);
      const attachment = url.pathname.match(/^\/messages\/(\d+)\/attachments\/(\d+)$/);
      if (req.method === 'GET' && url.pathname === '/messages') {
        res.setHeader('Content-Type', 'application/json');
        res.end(JSON.stringify(received.map((m) => ({ ...m, attachments: m.attachments.map(({ content, ...a }) => ({ ...a, bytes: content.length })) }))));
      } else if (req.method === 'GET' && attachment) {
        const file = received.find((m) => m.id === Number(attachment[1]))?.attachments[Number(attachment[2])];
        if (!file) {
          res.statusCode = 404;
          res.end('no such attachment');
          return;
        }
        res.setHeader('Content-Type', file.contentType);
        res.end(file.content);
      } else if (req.method === 'DELETE' && url.pathname === '/messages') {
        received.length = 0;
        res.statusCode = 204;
        res.end();
      } else {
        res.statusCode = 404;
        res.end('not found');
      }
    });
    await listen(httpServer, options.httpPort);
  }

  return {
    smtpPort,
    httpPort: httpServer ? (httpServer.address() as AddressInfo).port : null,
    messages: () => [...received],
    waitFor(predicate, timeoutMs = 10_000) {
      const found = received.find(predicate);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const waiter = { predicate, resolve: (m: FakeMessage) => (clearTimeout(timer), resolve(m)) };
        const timer = setTimeout(() => {
          waiters.splice(waiters.indexOf(waiter), 1);
          reject(new Error(`no matching message within ${timeoutMs} ms (${received.length} received)`));
        }, timeoutMs);
        waiters.push(waiter);
      });
    },
    clear: () => {
      received.length = 0;
    },
    close: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      if (httpServer) {
        httpServer.closeAllConnections();
        await new Promise((resolve) => httpServer!.close(resolve));
      }
    },
  };
}

// Standalone: the start and test scripts run this file as its own process.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const smtpPort = Number(process.env.SMTP_FAKE_PORT ?? 2525);
  const httpPort = Number(process.env.SMTP_FAKE_HTTP_PORT ?? 2526);
  const fake = await startFakeSmtp({ smtpPort, httpPort });
  process.stdout.write(`SMTP fake on smtp://${HOST}:${fake.smtpPort}, received mail at http://${HOST}:${fake.httpPort}/messages\n`);
  const stop = () => void fake.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
