import { spawn } from 'node:child_process';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { assertPortFree, stopChild, waitForOwnServer, waitForReadyMessage } from './processes.cjs';

/** A stand-in for whatever may hold a port: answers /api/health with the given status and body. */
async function serverAnswering(status: number, body: string): Promise<{ port: number; close: () => Promise<void> }> {
  const server = http.createServer((_req, res) => {
    res.writeHead(status, { 'content-type': body.startsWith('{') ? 'application/json' : 'text/plain' });
    res.end(body);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return { port, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

describe('launcher readiness checks (server/scripts/processes.cjs)', () => {
  it('refuses a port that another process listens on, naming the port and how to find the process', async () => {
    const other = await serverAnswering(200, 'hello');
    try {
      await expect(assertPortFree(other.port, { what: 'the web server', envName: 'PORT' })).rejects.toThrow(
        new RegExp(
          `port ${other.port} on 127\\.0\\.0\\.1 \\(the web server\\) is already in use.*ss -ltnp 'sport = :${other.port}'.*PORT=<port>`,
        ),
      );
    } finally {
      await other.close();
    }
    // Once it is gone the port is free again.
    await expect(assertPortFree(other.port)).resolves.toBeUndefined();
  });

  it('does not take a foreign Spincycle server (another instance id) for the one just started', async () => {
    const foreign = await serverAnswering(200, JSON.stringify({ status: 'ok', database: 'reachable', instanceId: 'stale-process' }));
    try {
      await expect(waitForOwnServer(`http://127.0.0.1:${foreign.port}/api/health`, 'ours', { timeoutMs: 5000 })).rejects.toThrow(
        /another server answers .*instance stale-process.*not the web server just started/,
      );
    } finally {
      await foreign.close();
    }
  });

  it('does not take any other program on the port for ours', async () => {
    const other = await serverAnswering(200, 'OK');
    try {
      await expect(waitForOwnServer(`http://127.0.0.1:${other.port}/api/health`, 'ours', { timeoutMs: 5000 })).rejects.toThrow(
        /HTTP 200 without a Spincycle instance id/,
      );
    } finally {
      await other.close();
    }
  });

  it('accepts our own server once it answers 200 with our instance id, and waits while it is degraded', async () => {
    const own = await serverAnswering(200, JSON.stringify({ status: 'ok', database: 'reachable', instanceId: 'ours' }));
    try {
      await expect(waitForOwnServer(`http://127.0.0.1:${own.port}/api/health`, 'ours', { timeoutMs: 5000 })).resolves.toMatchObject({
        instanceId: 'ours',
      });
    } finally {
      await own.close();
    }
    const degraded = await serverAnswering(503, JSON.stringify({ status: 'degraded', database: 'unreachable', instanceId: 'ours' }));
    try {
      await expect(waitForOwnServer(`http://127.0.0.1:${degraded.port}/api/health`, 'ours', { timeoutMs: 800 })).rejects.toThrow(
        /did not become ready .*HTTP 503, database unreachable/,
      );
    } finally {
      await degraded.close();
    }
  });

  it('fails as soon as the child it waits for exits', async () => {
    const child = spawn(process.execPath, ['-e', 'process.exit(3)']);
    await new Promise((resolve) => child.once('exit', resolve));
    await expect(waitForOwnServer('http://127.0.0.1:9/api/health', 'ours', { timeoutMs: 5000, child, name: 'web server' })).rejects.toThrow(
      /web server exited with code 3/,
    );
  });

  it('takes a ready message only with our instance id, and stops a child with SIGTERM', async () => {
    const script =
      "process.send({ type: 'ready', instanceId: process.env.ID }); process.on('SIGTERM', () => process.exit(0)); setInterval(() => {}, 1000);";
    const ours = spawn(process.execPath, ['-e', script], {
      env: { ...process.env, ID: 'w1' },
      stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    });
    await expect(waitForReadyMessage(ours, 'w1', { timeoutMs: 10_000 })).resolves.toMatchObject({ instanceId: 'w1' });
    await expect(stopChild(ours, { graceMs: 5000 })).resolves.toBe(true);

    const other = spawn(process.execPath, ['-e', script], {
      env: { ...process.env, ID: 'w2' },
      stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    });
    await expect(waitForReadyMessage(other, 'w1', { timeoutMs: 10_000, name: 'worker' })).rejects.toThrow(
      /worker reported instance w2, expected w1/,
    );
    await stopChild(other, { graceMs: 5000 });
  });
});
