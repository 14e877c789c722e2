import { afterAll, describe, expect, it } from 'vitest';
import type { ChildProcess } from 'node:child_process';
import { ApiClient } from '../setup/test-app.js';
import { demoUser } from '../setup/demo.js';
import { freePort, startServerProcess, stopServerProcess } from '../setup/server-process.js';

let child: ChildProcess | undefined;
afterAll(async () => {
  if (child) await stopServerProcess(child, 'SIGKILL');
});

describe('sessions live in PostgreSQL', () => {
  it('keeps a signed-in user signed in across a server restart', async () => {
    const port = await freePort();
    child = await startServerProcess(port);
    const client = new ApiClient(`http://127.0.0.1:${port}`);
    await client.signIn(demoUser('estimator'));
    expect((await client.get('/api/homes?limit=1')).status).toBe(200);

    await stopServerProcess(child, 'SIGKILL');
    child = await startServerProcess(port);

    const session = await client.get('/api/auth/session');
    expect(session.body.user?.email).toBe(demoUser('estimator'));
    expect((await client.get('/api/homes?limit=1')).status).toBe(200);
    // The CSRF token stored in the session survives too: a write still works.
    client.csrfToken = session.body.csrfToken;
    const created = await client.post('/api/builders', { name: `Restart Check ${port}` });
    expect(created.status).toBe(201);
  });
});
