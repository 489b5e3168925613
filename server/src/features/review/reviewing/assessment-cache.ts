import { LRUCache } from 'lru-cache';
import {
  summarizeAssessment,
  type TechnicalAssessment,
  type TechnicalAssessmentSummary,
} from '@spincycle/shared/review/technical-assessment';

/** A proposal's technical assessment with the grading table's short form of it, computed once. */
export interface KeptAssessment {
  assessment: TechnicalAssessment;
  summary: TechnicalAssessmentSummary;
}

export const keepAssessment = (assessment: TechnicalAssessment): KeptAssessment => ({
  assessment,
  summary: summarizeAssessment(assessment),
});

/** One proposal whose assessment a request needs, with the key of everything it depends on. */
export interface AssessmentWanted {
  proposalId: number;
  /** Undefined when the proposal has no plan run row to version its plans by: computed, never kept. */
  key: string | undefined;
}

/** Assessments one web process keeps (each a few kB; a large cycle has a few thousand proposals). */
export const ASSESSMENT_CACHE_ENTRIES = 20_000;

/**
 * Technical assessments the web process has already computed, by a key made of everything an
 * assessment depends on, read from the database before the assessment's inputs are read: the
 * proposal, its `plan_runs` row's `inputs_version` (raised by triggers in the transaction of
 * every change of its targets, names included, its requested nodes, its completeness, its
 * cycle's campaign, a node or a site) and `plans_version` (raised by every write of its
 * `target_plans` rows), the campaign's length and the completeness goal. The versions only grow,
 * so a key once superseded is never read again, and a kept assessment is never older than its
 * key. Grades, assignments and conflicts are not part of an assessment: they are read on every
 * request. Concurrent requests missing the same key share one computation.
 */
export class AssessmentCache {
  private readonly kept: LRUCache<string, KeptAssessment>;
  private readonly pending = new Map<string, Promise<KeptAssessment>>();

  constructor(maxEntries = ASSESSMENT_CACHE_ENTRIES) {
    this.kept = new LRUCache<string, KeptAssessment>({ max: maxEntries });
  }

  /**
   * The assessments of the wanted proposals, by proposal id; `compute` is called once, with the
   * proposals neither kept nor being computed by another request (and not at all when none is).
   */
  async getMany(wanted: readonly AssessmentWanted[], compute: (proposalIds: number[]) => Promise<Map<number, KeptAssessment>>) {
    const out = new Map<number, KeptAssessment>();
    const waiting: Promise<void>[] = [];
    const missing: AssessmentWanted[] = [];
    const missingIds = new Set<number>();
    for (const w of wanted) {
      const kept = w.key === undefined ? undefined : this.kept.get(w.key);
      if (kept) {
        out.set(w.proposalId, kept);
        continue;
      }
      const pending = w.key === undefined ? undefined : this.pending.get(w.key);
      if (pending) waiting.push(pending.then((a) => void out.set(w.proposalId, a)));
      else if (!missingIds.has(w.proposalId)) {
        missingIds.add(w.proposalId);
        missing.push(w);
      }
    }
    if (missing.length) {
      const batch = compute(missing.map((m) => m.proposalId));
      for (const m of missing) {
        const one = batch.then((computed) => {
          const a = computed.get(m.proposalId);
          if (!a) throw new Error(`no assessment computed for proposal ${m.proposalId}`);
          return a;
        });
        if (m.key !== undefined) {
          const key = m.key;
          this.pending.set(key, one);
          one.then(
            (a) => {
              this.kept.set(key, a);
              this.pending.delete(key);
            },
            () => this.pending.delete(key),
          );
        }
        waiting.push(one.then((a) => void out.set(m.proposalId, a)));
      }
    }
    await Promise.all(waiting);
    return out;
  }

  /** Number of assessments kept (for tests). */
  get size(): number {
    return this.kept.size;
  }
}
