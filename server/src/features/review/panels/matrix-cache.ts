import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import type { MatrixSource } from './panel-repository';

/** One matrix answer ready to send: its JSON bytes and their ETag. */
export interface MatrixBody {
  body: Buffer;
  etag: string;
}

/** The answer to send for this JSON text. */
export function toMatrixBody(json: string): MatrixBody {
  const body = Buffer.from(json, 'utf8');
  return { body, etag: `W/"${body.length.toString(16)}-${createHash('sha1').update(body).digest('base64url')}"` };
}

/** Panels whose last answer one web process keeps (each about 100 kB for 200 proposals × 6 members). */
export const MATRIX_CACHE_PANELS = 64;

/**
 * The last matrix answer built for each panel, with the source texts it was built from (see
 * readMatrixSource: everything the matrix shows, read fresh from the database on every request).
 * The answer is a function of those texts alone, so it is sent again only when the texts read
 * now are equal to the kept ones: a grade, an assignment, a conflict, a team or member change
 * changes a text, and the answer is built anew. Nothing is kept on trust of a version.
 */
export class MatrixCache {
  private readonly kept = new LRUCache<number, { source: MatrixSource; answer: MatrixBody }>({ max: MATRIX_CACHE_PANELS });

  /** The kept answer of the panel when it was built from exactly `source`, else the one `build` makes (then kept). */
  get(panelId: number, source: MatrixSource, build: () => string): MatrixBody {
    const kept = this.kept.get(panelId);
    if (
      kept &&
      kept.source.panel === source.panel &&
      kept.source.reviewers === source.reviewers &&
      kept.source.proposals === source.proposals
    ) {
      return kept.answer;
    }
    const answer = toMatrixBody(build());
    this.kept.set(panelId, { source, answer });
    return answer;
  }

  /** Number of panels kept (for tests). */
  get size(): number {
    return this.kept.size;
  }
}
