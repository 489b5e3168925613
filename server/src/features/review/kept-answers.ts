import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';

/** One answer ready to send: its JSON bytes and their ETag. */
export interface KeptBody {
  body: Buffer;
  etag: string;
}

/** The answer to send for this JSON text. */
export function toKeptBody(json: string): KeptBody {
  const body = Buffer.from(json, 'utf8');
  return { body, etag: `W/"${body.length.toString(16)}-${createHash('sha1').update(body).digest('base64url')}"` };
}

/** What a build gives: the answer's JSON, and the time (epoch ms) until which it holds, when it depends on the time. */
export interface BuiltAnswer {
  json: string;
  validUntil?: number;
}

/** Bytes of answers one cache keeps (the grading table of 100 proposals is about 60 kB, a 200 × 6 matrix about 100 kB). */
export const KEPT_ANSWER_BYTES = 32 * 1024 * 1024;

/**
 * Answers of the review's read-heavy routes (the grading table, a panel's matrix) that one web
 * process has built, each under its key (who asks for what) with the review's read versions it
 * was built under (review-read-version.ts). An answer is sent again only while the versions
 * read now equal the kept ones (every write of anything it shows raises them, in the writing
 * transaction) and, for an answer that depends on the time (a review deadline passing), until
 * its `validUntil`. Otherwise `build` runs and its answer is kept. Concurrent misses of one key
 * each build (the same rows give the same answer).
 */
export class KeptAnswers {
  private readonly kept: LRUCache<string, { versions: string; validUntil: number; answer: KeptBody }>;

  constructor(maxBytes = KEPT_ANSWER_BYTES) {
    this.kept = new LRUCache({ maxSize: maxBytes, sizeCalculation: (v) => Math.max(1, v.answer.body.length) });
  }

  async get(key: string, versions: string, now: number, build: () => Promise<BuiltAnswer>): Promise<KeptBody> {
    const kept = this.kept.get(key);
    if (kept && kept.versions === versions && now < kept.validUntil) return kept.answer;
    const built = await build();
    const answer = toKeptBody(built.json);
    if (answer.body.length <= this.kept.maxSize) {
      this.kept.set(key, { versions, validUntil: built.validUntil ?? Number.POSITIVE_INFINITY, answer });
    }
    return answer;
  }

  /** Number of answers kept (for tests). */
  get size(): number {
    return this.kept.size;
  }
}
