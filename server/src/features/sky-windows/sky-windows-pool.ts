import { availableParallelism } from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { SkyWindowsReport } from '@spincycle/shared/sky/index';
import { AppError } from '../../http/app-error';
import type { SkyWindowsJob } from './sky-windows-compute';
import type { SkyWindowsThreadReply, SkyWindowsThreadRequest } from './sky-windows-thread';

/** Threads at most: one core stays for the web process's event loop (and the database). */
const POOL_SIZE = Math.max(1, Math.min(2, availableParallelism() - 1));
/** Jobs waiting for a thread at most; more → 503 `sky_windows_busy` rather than a growing queue. */
const MAX_WAITING = 16;
/** A thread left idle this long is stopped (it is started again on demand). */
const IDLE_MS = 30_000;

const ENTRY = path.join(__dirname, 'sky-windows-thread-entry.cjs');
const TSCONFIG = path.resolve(__dirname, '../../../../tsconfig.json');

interface Pending {
  job: SkyWindowsJob;
  resolve(reports: SkyWindowsReport[]): void;
  reject(err: Error): void;
}

interface Slot {
  worker: Worker;
  current?: Pending & { id: number };
  idleTimer?: NodeJS.Timeout;
}

let nextId = 1;
let completedJobs = 0;
const slots = new Set<Slot>();
const waiting: Pending[] = [];

function startSlot(): Slot {
  // No inherited execArgv (`--import tsx` in the web process): the entry registers tsx itself.
  const worker = new Worker(ENTRY, { execArgv: [], env: { ...process.env, TSX_TSCONFIG_PATH: TSCONFIG } });
  // Idle threads never keep the process alive (tests, shutdown).
  worker.unref();
  const slot: Slot = { worker };
  worker.on('message', (reply: SkyWindowsThreadReply) => {
    const current = slot.current;
    if (!current || current.id !== reply.id) return;
    slot.current = undefined;
    completedJobs++;
    if (reply.ok) current.resolve(reply.reports);
    else current.reject(new Error(`sky windows failed on the worker thread: ${reply.message}`));
    dispatch();
  });
  const fail = (err: Error) => {
    slots.delete(slot);
    clearTimeout(slot.idleTimer);
    slot.current?.reject(err);
    slot.current = undefined;
    dispatch();
  };
  worker.on('error', fail);
  worker.on('exit', (code) => fail(new Error(`the sky-windows worker thread exited (code ${code})`)));
  slots.add(slot);
  return slot;
}

function dispatch(): void {
  while (waiting.length) {
    let slot = [...slots].find((s) => !s.current);
    if (!slot && slots.size < POOL_SIZE) slot = startSlot();
    if (!slot) return;
    const pending = waiting.shift()!;
    clearTimeout(slot.idleTimer);
    slot.idleTimer = undefined;
    slot.current = { ...pending, id: nextId++ };
    // The job is busy work: keep the process alive until it answers.
    slot.worker.ref();
    const request: SkyWindowsThreadRequest = { id: slot.current.id, job: pending.job };
    slot.worker.postMessage(request);
  }
  for (const slot of slots) {
    if (slot.current || slot.idleTimer) continue;
    slot.worker.unref();
    slot.idleTimer = setTimeout(() => void slot.worker.terminate(), IDLE_MS).unref();
  }
}

/**
 * Computes a sky-windows job on a worker thread of a small pool (at most POOL_SIZE threads,
 * started on demand, stopped when idle), so that the web process's event loop stays free
 * while it runs. 503 `sky_windows_busy` when MAX_WAITING jobs already wait for a thread.
 */
export function computeSkyWindowsOffThread(job: SkyWindowsJob): Promise<SkyWindowsReport[]> {
  if (waiting.length >= MAX_WAITING) {
    return Promise.reject(
      new AppError('sky_windows_busy', 'Too many large sky-window requests are being computed; try again in a minute', 503),
    );
  }
  return new Promise((resolve, reject) => {
    waiting.push({ job, resolve, reject });
    dispatch();
  });
}

/** Stops every thread of the pool (jobs still running are refused). */
export async function closeSkyWindowsPool(): Promise<void> {
  const all = [...slots];
  slots.clear();
  await Promise.all(
    all.map((s) => {
      clearTimeout(s.idleTimer);
      return s.worker.terminate();
    }),
  );
}

/** Threads running now and jobs answered by the pool since the process started (for tests and logs). */
export function skyWindowsPoolStats(): { threads: number; completedJobs: number } {
  return { threads: slots.size, completedJobs };
}
