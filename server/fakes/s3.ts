// A local S3-compatible object store for development and tests (s3rver): objects are files in a
// folder on this machine, served on loopback only. It accepts the key and secret S3RVER / S3RVER.
//
//   S3_FAKE_PORT=4569 node --import tsx server/fakes/s3.ts     (objects under .data/s3)
//   then S3_ENDPOINT=http://127.0.0.1:4569 for the app
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import S3rver from 's3rver';

const HOST = '127.0.0.1';

export interface FakeS3 {
  /** The endpoint to give the app as S3_ENDPOINT. */
  url: string;
  port: number;
  /** The folder holding the objects. */
  dir: string;
  close(): Promise<void>;
}

/**
 * Starts the fake on loopback (port 0 picks a free port). Without `dir` the objects go to a fresh
 * temporary folder that is removed on close.
 */
export async function startFakeS3(port: number, dir?: string): Promise<FakeS3> {
  const temporary = dir === undefined;
  const directory = dir ?? fs.mkdtempSync(path.join(os.tmpdir(), 'tractwise-s3-'));
  fs.mkdirSync(directory, { recursive: true });
  const server = new S3rver({ address: HOST, port, silent: true, directory, vhostBuckets: false });
  const address = await server.run();
  const url = `http://${HOST}:${address.port}`;
  return {
    url,
    port: address.port,
    dir: directory,
    close: async () => {
      server.httpServer?.closeAllConnections();
      await server.close();
      if (temporary) fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}

// Standalone: the start and dev scripts run this file as its own process.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const dir = path.resolve(fileURLToPath(new URL('../../.data/s3', import.meta.url)));
  const fake = await startFakeS3(Number(process.env.S3_FAKE_PORT ?? 4569), dir);
  process.stdout.write(`S3 fake on ${fake.url} (objects in ${fake.dir}; key and secret S3RVER)\n`);
  const stop = () => void fake.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
