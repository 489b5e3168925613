import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { instanceId } from './instance-id';

/**
 * GET /api/health: the process answers; `database` tells whether PostgreSQL does too (503 when
 * not); `instanceId` names this process (launchers check they reach the child they started).
 */
export function createHealthRoutes(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const started = performance.now();
    let database: 'reachable' | 'unreachable' = 'reachable';
    try {
      await ctx.db.raw('SELECT 1');
    } catch {
      database = 'unreachable';
    }
    const body = {
      status: database === 'reachable' ? 'ok' : 'degraded',
      database,
      instanceId,
      latencyMs: Math.round(performance.now() - started),
    };
    res.status(database === 'reachable' ? 200 : 503).json(body);
  });
  return router;
}
