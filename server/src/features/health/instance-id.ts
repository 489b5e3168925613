import { randomUUID } from 'node:crypto';

/**
 * This process's id, fixed at start: the one a launcher passed in SPINCYCLE_INSTANCE_ID (so that
 * it can tell its own child from a stale or foreign process on the same port), else a random one.
 * GET /api/health and the worker's ready message report it.
 */
export const instanceId: string = process.env.SPINCYCLE_INSTANCE_ID || randomUUID();
