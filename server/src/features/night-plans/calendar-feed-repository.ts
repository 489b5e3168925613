import type { Knex } from 'knex';

/** A node of a cycle, as a calendar link names it. */
export interface FeedNode {
  nodeId: number;
  code: string;
  name: string;
}

/**
 * The node when the cycle offers it (its `cycle_nodes` row), else undefined. `lock` takes that
 * row FOR NO KEY UPDATE, so that two changes of the same node's link queue one behind the other.
 */
export async function findCycleNode(
  db: Knex,
  cycleId: number,
  nodeId: number,
  options: { lock?: boolean } = {},
): Promise<FeedNode | undefined> {
  const q = db('cycle_nodes as cn')
    .join('nodes as n', 'n.id', 'cn.node_id')
    .where({ 'cn.cycle_id': cycleId, 'cn.node_id': nodeId })
    .first('n.id', 'n.code', 'n.name');
  if (options.lock) q.forNoKeyUpdate('cn');
  const row = (await q) as { id: number; code: string; name: string } | undefined;
  return row ? { nodeId: row.id, code: row.code, name: row.name } : undefined;
}

/** A stored calendar link (never its secret; the hash stays in this file). */
export interface StoredCalendarFeed {
  id: number;
  cycleId: number;
  nodeId: number;
  createdAt: Date;
  /** Display name of who made it; null when that account no longer exists. */
  createdBy: string | null;
}

interface FeedRow {
  id: number;
  cycle_id: number;
  node_id: number;
  created_at: Date;
  display_name: string | null;
}

const toFeed = (r: FeedRow): StoredCalendarFeed => ({
  id: r.id,
  cycleId: r.cycle_id,
  nodeId: r.node_id,
  createdAt: r.created_at,
  createdBy: r.display_name,
});

const feedColumns = ['f.id', 'f.cycle_id', 'f.node_id', 'f.created_at', 'a.display_name'];

/** The node's working (not stopped) link in the cycle, if any. */
export async function findActiveFeed(db: Knex, cycleId: number, nodeId: number): Promise<StoredCalendarFeed | undefined> {
  const row = (await db('calendar_feeds as f')
    .leftJoin('accounts as a', 'a.id', 'f.created_by')
    .where({ 'f.cycle_id': cycleId, 'f.node_id': nodeId })
    .whereNull('f.revoked_at')
    .first(feedColumns)) as FeedRow | undefined;
  return row ? toFeed(row) : undefined;
}

/** The working link whose secret hashes to `tokenHash` (the unique index finds it), if any. */
export async function findActiveFeedByHash(db: Knex, tokenHash: string): Promise<StoredCalendarFeed | undefined> {
  const row = (await db('calendar_feeds as f')
    .leftJoin('accounts as a', 'a.id', 'f.created_by')
    .where('f.token_hash', tokenHash)
    .whereNull('f.revoked_at')
    .first(feedColumns)) as FeedRow | undefined;
  return row ? toFeed(row) : undefined;
}

/** Stores a new working link; returns its id. */
export async function insertFeed(
  db: Knex,
  feed: { cycleId: number; nodeId: number; tokenHash: string; createdBy: number; at: Date },
): Promise<number> {
  const [{ id }] = (await db('calendar_feeds')
    .insert({
      cycle_id: feed.cycleId,
      node_id: feed.nodeId,
      token_hash: feed.tokenHash,
      created_by: feed.createdBy,
      created_at: feed.at,
    })
    .returning('id')) as { id: number }[];
  return id;
}

/** Stops a link (if it still works); true when it did. */
export async function revokeFeed(db: Knex, feedId: number, by: number, at: Date): Promise<boolean> {
  const n = await db('calendar_feeds').where('id', feedId).whereNull('revoked_at').update({ revoked_at: at, revoked_by: by });
  return n > 0;
}
