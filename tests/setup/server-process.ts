import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { startFakeS3 } from '../../server/fakes/s3.js';

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as { port: number };
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

/**
 * Starts `tsx server/index.ts` as its own process (what `npm start` runs) and waits for /api/health.
 * Unless `extraEnv` names an S3_ENDPOINT, the server gets its own object store: a fake S3 in this
 * process on a free port, with a temporary folder, stopped when the server exits.
 */
export async function startServerProcess(port: number, extraEnv: Record<string, string> = {}): Promise<ChildProcess> {
  const s3 = extraEnv.S3_ENDPOINT ? null : await startFakeS3(0);
  // One process (node with tsx's loader), so a kill really stops the server: the tsx CLI would leave a child behind.
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      DATABASE_URL: process.env.TEST_DATABASE_URL!,
      PORT: String(port),
      HOST: '127.0.0.1',
      NODE_ENV: 'test',
      LOG_LEVEL: 'warn',
      SESSION_SECRET: 'test-session-secret-0123456789',
      ...(s3 ? { S3_ENDPOINT: s3.url } : {}),
      ...extraEnv,
    },
    // The server's log (stdout) is shown only when a bench asks for it (BENCH_LOG_LEVEL): the import's stage timings.
    stdio: ['ignore', process.env.BENCH_LOG_LEVEL ? 'inherit' : 'ignore', 'inherit'],
  });
  if (s3) child.once('exit', () => void s3.close());
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}`);
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`);
      if (res.ok) return child;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  child.kill('SIGKILL');
  throw new Error('server did not become healthy within 30 s');
}

export async function stopServerProcess(child: ChildProcess, signal: NodeJS.Signals = 'SIGTERM') {
  if (child.exitCode !== null) return;
  await new Promise<void>((resolve) => {
    child.once('exit', () => resolve());
    child.kill(signal);
  });
}
