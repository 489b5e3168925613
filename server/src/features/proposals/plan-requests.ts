import type { Knex } from 'knex';
import type { AppContext } from '../../app-context';

/**
 * Records, inside the caller's transaction, that the proposals' plans must be computed again.
 * A run in progress keeps its `running` state (its own end notices the change and leaves the
 * run `queued`); any other run becomes `queued`.
 */
export async function markPlansRequested(db: Knex, proposalIds: number[]): Promise<void> {
  if (!proposalIds.length) return;
  await db.raw(
    `INSERT INTO plan_runs (proposal_id, state, requested_at)
     SELECT unnest(?::int[]), 'queued', clock_timestamp()
     ON CONFLICT (proposal_id) DO UPDATE SET
       requested_at = clock_timestamp(),
       state = CASE WHEN plan_runs.state = 'running' THEN 'running' ELSE 'queued' END,
       error = CASE WHEN plan_runs.state = 'running' THEN plan_runs.error ELSE NULL END`,
    [proposalIds],
  );
}

/**
 * Hands the proposals to the plan queue, after the transaction that changed them committed
 * (a job must not start before its inputs are visible). A queue failure does not fail the
 * request: the run stays `queued` and stale, the worker re-queues such runs when it starts,
 * and the team can ask for a recomputation.
 */
export async function queuePlanComputations(ctx: AppContext, proposalIds: number[]): Promise<void> {
  for (const id of proposalIds) {
    try {
      await ctx.planQueue.enqueue(id);
    } catch (err) {
      ctx.logger.error({ err, proposalId: id }, 'could not queue the plan computation');
    }
  }
}
