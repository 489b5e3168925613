import { randomUUID } from 'node:crypto';
import { loadSettings } from '../../config';

/**
 * This process's id, fixed at start: the one a launcher passed in the SPINCYCLE_INSTANCE_ID
 * setting (config.ts; so that it can tell its own child from a stale or foreign process on the
 * same port), else a random one.
 * GET /api/health and the worker's ready message report it.
 */
export const instanceId: string = loadSettings().SPINCYCLE_INSTANCE_ID ?? randomUUID();
