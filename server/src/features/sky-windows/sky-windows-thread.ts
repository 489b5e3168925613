/**
 * Body of a sky-windows worker thread (started by sky-windows-pool.ts through
 * sky-windows-thread-entry.cjs): takes jobs from the parent port one at a time and answers
 * each with its reports or its error message.
 */
import { parentPort } from 'node:worker_threads';
import { computeSkyWindowsJob, type SkyWindowsJob } from './sky-windows-compute';

export interface SkyWindowsThreadRequest {
  id: number;
  job: SkyWindowsJob;
}

export type SkyWindowsThreadReply =
  { id: number; ok: true; reports: ReturnType<typeof computeSkyWindowsJob> } | { id: number; ok: false; message: string };

if (!parentPort) throw new Error('sky-windows-thread.ts runs inside a worker thread only');
const port = parentPort;
port.on('message', (request: SkyWindowsThreadRequest) => {
  let reply: SkyWindowsThreadReply;
  try {
    reply = { id: request.id, ok: true, reports: computeSkyWindowsJob(request.job) };
  } catch (err) {
    reply = { id: request.id, ok: false, message: err instanceof Error ? err.message : String(err) };
  }
  port.postMessage(reply);
});
