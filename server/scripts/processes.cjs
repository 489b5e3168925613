'use strict';
// Child processes of the launchers (`npm start`, `npm test`, the browser suite's global set-up):
// is the port free, is the server that answers really the one we started, is the worker ready,
// stop a child and wait for it. Plain CommonJS without dependencies: the .mjs scripts import it
// (before `npm ci` has run) and TypeScript set-up and specs require it (types in processes.d.cts).
const net = require('node:net');

const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));

/** True once a child has exited (by code or by signal). */
function hasExited(child) {
  return child.exitCode !== null || child.signalCode !== null;
}

function exitDescription(child) {
  return child.signalCode ? `signal ${child.signalCode}` : `code ${child.exitCode}`;
}

/**
 * Resolves when nothing listens on host:port (we can bind it ourselves); rejects with an error
 * naming the port, what it is for, the setting that moves it and how to find the process.
 */
function assertPortFree(port, { host = '127.0.0.1', what = 'a Spincycle process', envName } = {}) {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.unref();
    probe.once('error', (err) => {
      if (err.code !== 'EADDRINUSE' && err.code !== 'EACCES') return reject(err);
      reject(
        new Error(
          `port ${port} on ${host} (${what}) is already in use by another process. ` +
            `Find it with \`ss -ltnp 'sport = :${port}'\` (or \`lsof -iTCP:${port} -sTCP:LISTEN\`), ` +
            `stop it${envName ? `, or choose another port with ${envName}=<port>` : ''}.`,
        ),
      );
    });
    probe.listen({ port, host, exclusive: true }, () => probe.close(() => resolve()));
  });
}

/**
 * Waits until `healthUrl` (GET /api/health) answers 200 with `instanceId`, the id the launcher
 * gave the child in SPINCYCLE_INSTANCE_ID. Any other answer on the port (a stale or foreign
 * process, which may not even be Spincycle) fails at once: it is not our server.
 */
async function waitForOwnServer(healthUrl, instanceId, { timeoutMs = 30_000, child, name = 'web server' } = {}) {
  if (!instanceId) throw new Error('waitForOwnServer needs the instance id given to the child');
  const until = Date.now() + timeoutMs;
  let last = 'no answer yet';
  while (Date.now() < until) {
    if (child && hasExited(child)) throw new Error(`${name} exited with ${exitDescription(child)} before it was ready`);
    let res;
    try {
      res = await fetch(healthUrl, { signal: AbortSignal.timeout(3000) });
    } catch {
      await sleep(150);
      continue;
    }
    let body = null;
    try {
      body = await res.json();
    } catch {
      body = null;
    }
    const answered = body && typeof body === 'object' && typeof body.instanceId === 'string' ? body.instanceId : null;
    if (answered !== instanceId) {
      const port = new URL(healthUrl).port;
      throw new Error(
        `another server answers at ${healthUrl} (${answered ? `instance ${answered}` : `HTTP ${res.status} without a Spincycle instance id`}), ` +
          `not the ${name} just started (instance ${instanceId}). ` +
          `Find what listens on port ${port} with \`ss -ltnp 'sport = :${port}'\` and stop it.`,
      );
    }
    if (res.ok) return body;
    last = `HTTP ${res.status}${body && body.database ? `, database ${body.database}` : ''}`;
    await sleep(250);
  }
  throw new Error(`${name} did not become ready at ${healthUrl} within ${timeoutMs / 1000} s (last answer: ${last})`);
}

/**
 * Waits for a child started with an IPC channel to send `{ type: 'ready', instanceId }` with our
 * id (the plan worker does so once pg-boss works its queue).
 */
function waitForReadyMessage(child, instanceId, { timeoutMs = 30_000, name = 'child' } = {}) {
  return new Promise((resolve, reject) => {
    if (hasExited(child)) return reject(new Error(`${name} exited with ${exitDescription(child)} before it was ready`));
    const done = (fn, value) => {
      clearTimeout(timer);
      child.off('message', onMessage);
      child.off('exit', onExit);
      fn(value);
    };
    const onMessage = (msg) => {
      if (msg && msg.type === 'ready') {
        if (msg.instanceId === instanceId) done(resolve, msg);
        else done(reject, new Error(`${name} reported instance ${msg.instanceId}, expected ${instanceId}`));
      }
    };
    const onExit = () => done(reject, new Error(`${name} exited with ${exitDescription(child)} before it was ready`));
    const timer = setTimeout(() => done(reject, new Error(`${name} was not ready within ${timeoutMs / 1000} s`)), timeoutMs);
    child.on('message', onMessage);
    child.once('exit', onExit);
  });
}

/**
 * Asks a child to stop (SIGTERM, or `signal`) and waits up to `graceMs` for it to exit, then
 * kills it. With `group`, signals the child's whole process group (a child spawned detached).
 * Resolves to true when it exited within the grace period.
 */
function stopChild(child, { graceMs = 6000, signal = 'SIGTERM', group = false } = {}) {
  if (hasExited(child)) return Promise.resolve(true);
  const send = (sig) => {
    try {
      if (group && child.pid) process.kill(-child.pid, sig);
      else child.kill(sig);
    } catch {
      // already gone
    }
  };
  return new Promise((resolve) => {
    const timer = setTimeout(() => {
      send('SIGKILL');
      resolve(false);
    }, graceMs);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve(true);
    });
    send(signal);
  });
}

module.exports = { assertPortFree, waitForOwnServer, waitForReadyMessage, stopChild, hasExited };
