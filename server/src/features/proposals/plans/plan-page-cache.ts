import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';

/** One answer of the plans list, ready to send: its JSON bytes and their ETag. */
export interface PlanPageBody {
  body: Buffer;
  etag: string;
}

/** The answer to send for this JSON text. */
export function toPlanPageBody(json: string): PlanPageBody {
  const body = Buffer.from(json, 'utf8');
  return { body, etag: `W/"${body.length.toString(16)}-${createHash('sha1').update(body).digest('base64url')}"` };
}

/** Bytes of answers one web process keeps (about 170 first pages of 60 targets on 3 nodes). */
export const PLAN_PAGE_CACHE_BYTES = 32 * 1024 * 1024;

/**
 * Plans-list answers the web process has already built, by key, least recently used first out
 * once their bytes pass the bound. The caller makes the key from everything the answer depends
 * on, read from the database before the answer is built (the proposal, its plan run row with
 * its versions, the query): the versions only grow and change in the transaction of the write
 * they stand for, so a key once superseded is never read again, and an answer is never older
 * than its key. Access is checked before the cache is asked, on every request.
 */
export class PlanPageCache {
  private readonly pages: LRUCache<string, PlanPageBody>;

  constructor(maxBytes = PLAN_PAGE_CACHE_BYTES) {
    this.pages = new LRUCache<string, PlanPageBody>({ maxSize: maxBytes, sizeCalculation: (page, key) => page.body.length + key.length });
  }

  /** The answer under `key`, built by `build` when not kept; an undefined key is never kept. */
  async get(key: string | undefined, build: () => Promise<string>): Promise<PlanPageBody> {
    const kept = key === undefined ? undefined : this.pages.get(key);
    if (kept) return kept;
    const page = toPlanPageBody(await build());
    if (key !== undefined && page.body.length < this.pages.maxSize) this.pages.set(key, page);
    return page;
  }

  /** Number of answers kept (for tests). */
  get size(): number {
    return this.pages.size;
  }
}
