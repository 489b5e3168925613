/**
 * Calendar subscription links of a node's night plan: a facility manager makes one (which stops
 * the previous one), sees whether one works and stops it; a calendar application reads the plan
 * through it without signing in. The link's secret (32 random bytes, base64url) is answered once
 * and stored only as its SHA-256, looked up through a unique index (no comparison of secrets,
 * so no timing to guard). Every change is written in one transaction with its audit row, which
 * never holds the secret or its hash.
 */
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { calendarFeedTokenSchema, type CalendarFeedLink, type CalendarFeedStatus } from '@spincycle/shared/night-plans/night-plans';
import type { Knex } from 'knex';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { insertAudit } from '../awards/award-repository';
import { hashLinkToken, newLinkToken } from '../auth/link-token';
import { findActiveFeed, findActiveFeedByHash, findCycleNode, insertFeed, revokeFeed, type FeedNode } from './calendar-feed-repository';
import { exportNodePlan } from './night-plan-service';
import { findNightPlanCycle } from './night-plan-repository';

const cycleNotFound = (id: number) => new AppError('cycle_not_found', `No cycle ${id}`, 404);
const nodeNotFound = (id: number) => new AppError('node_not_found', `No node ${id} in this cycle`, 404);
const feedNotFound = () =>
  new AppError(
    'calendar_feed_not_found',
    'There is no calendar at this address: the link was stopped or replaced. Ask the facility manager for the new link.',
    404,
  );

/** The public address of a link's feed. */
export const calendarFeedUrl = (ctx: AppContext, token: string) => `${ctx.config.publicUrl}/api/calendar-feeds/${token}.ics`;

/** The node of the cycle (404 for an unknown cycle, or a node the cycle does not offer); `lock` as in findCycleNode. */
async function requireFeedNode(db: Knex, cycleId: number, nodeId: number, options: { lock?: boolean } = {}): Promise<FeedNode> {
  if (!(await findNightPlanCycle(db, cycleId))) throw cycleNotFound(cycleId);
  const node = await findCycleNode(db, cycleId, nodeId, options);
  if (!node) throw nodeNotFound(nodeId);
  return node;
}

/** What the audit log keeps of a link: the node and the day it was made (never its secret). */
const linkValue = (node: FeedNode, createdAt: Date) => ({ node: node.code, link: `made ${createdAt.toISOString().slice(0, 10)}` });

/** GET …/calendar-feed. */
export async function getCalendarFeed(ctx: AppContext, cycleId: number, nodeId: number): Promise<CalendarFeedStatus> {
  await requireFeedNode(ctx.db, cycleId, nodeId);
  const feed = await findActiveFeed(ctx.db, cycleId, nodeId);
  return feed
    ? { active: true, createdAt: feed.createdAt.toISOString(), createdBy: feed.createdBy }
    : { active: false, createdAt: null, createdBy: null };
}

/** POST …/calendar-feed: a new link, stopping the working one in the same transaction; its address is answered this once. */
export async function makeCalendarFeed(ctx: AppContext, viewer: SessionUser, cycleId: number, nodeId: number): Promise<CalendarFeedLink> {
  const token = newLinkToken();
  const at = ctx.now();
  await ctx.db.transaction(async (trx) => {
    const node = await requireFeedNode(trx, cycleId, nodeId, { lock: true });
    const previous = await findActiveFeed(trx, cycleId, nodeId);
    if (previous) await revokeFeed(trx, previous.id, viewer.id, at);
    const id = await insertFeed(trx, { cycleId, nodeId, tokenHash: hashLinkToken(token), createdBy: viewer.id, at });
    await insertAudit(trx, [
      {
        actorAccountId: viewer.id,
        cycleId,
        entity: 'calendar_feed',
        entityId: id,
        action: previous ? 'replace_link' : 'make_link',
        before: previous ? linkValue(node, previous.createdAt) : null,
        after: { node: node.code, link: 'new' },
        reason: null,
        at,
      },
    ]);
  });
  return { url: calendarFeedUrl(ctx, token), createdAt: at.toISOString() };
}

/** DELETE …/calendar-feed: stops the working link (404 `calendar_feed_not_found` when there is none). */
export async function stopCalendarFeed(ctx: AppContext, viewer: SessionUser, cycleId: number, nodeId: number): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    const node = await requireFeedNode(trx, cycleId, nodeId, { lock: true });
    const feed = await findActiveFeed(trx, cycleId, nodeId);
    if (!feed) throw new AppError('calendar_feed_not_found', `Node ${node.code} has no calendar link to stop`, 404);
    const at = ctx.now();
    await revokeFeed(trx, feed.id, viewer.id, at);
    await insertAudit(trx, [
      {
        actorAccountId: viewer.id,
        cycleId,
        entity: 'calendar_feed',
        entityId: feed.id,
        action: 'stop_link',
        before: linkValue(node, feed.createdAt),
        after: { node: node.code, link: 'stopped' },
        reason: null,
        at,
      },
    ]);
  });
}

/**
 * GET /api/calendar-feeds/:token.ics (no session): the node's plan as iCalendar, the same body
 * as the manager's download. 404 `calendar_feed_not_found` for a malformed, unknown or stopped
 * link, and for a node the cycle no longer offers (one answer, whatever the cause).
 */
export async function readCalendarFeed(ctx: AppContext, token: string) {
  const parsed = calendarFeedTokenSchema.safeParse(token);
  if (!parsed.success) throw feedNotFound();
  const feed = await findActiveFeedByHash(ctx.db, hashLinkToken(parsed.data));
  if (!feed) throw feedNotFound();
  try {
    return await exportNodePlan(ctx, feed.cycleId, feed.nodeId, 'ics');
  } catch (err) {
    if (err instanceof AppError && err.status === 404) throw feedNotFound();
    throw err;
  }
}
