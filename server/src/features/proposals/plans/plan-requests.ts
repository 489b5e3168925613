import type { AppContext } from '../../../app-context';

/**
 * Hands the proposals to the plan queue, after the transaction that changed them (and marked
 * their plans requested: markPlansRequested in plan-repository) committed: a job must not
 * start before its inputs are visible. A queue failure does not fail the request: the run
 * stays `queued` and stale, the worker re-queues such runs when it starts, and the team can
 * ask for a recomputation.
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
