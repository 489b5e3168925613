import { HttpErrorResponse } from '@angular/common/http';
import { signal } from '@angular/core';
import { GRADE_MAX, GRADE_MIN, type MyReviewRow, type SaveReviewInput } from '@spincycle/shared/review/reviewing';
import type { Observable, Subscription } from 'rxjs';
import { readApiError } from '../../../core/http/api-error-message';

/** What a row shows about its own saving. */
export type SaveStatus = 'idle' | 'pending' | 'saving' | 'saved' | 'failed' | 'invalid' | 'conflict' | 'locked';

/** The editable part of a review. */
export type ReviewDraft = Omit<SaveReviewInput, 'version'>;

/** Quiet time after the last keystroke before a row saves on its own. */
export const SAVE_DEBOUNCE_MS = 800;
/** Waits before the automatic retries of a failed save: 2 s, 4 s, 8 s… at most 60 s. */
export function retryDelayMs(attempt: number): number {
  return Math.min(60_000, 2000 * 2 ** Math.max(0, attempt - 1));
}

/**
 * The grade as typed: empty is "no grade yet"; otherwise 0.0–10.0 with at most one decimal
 * (a comma is read as the decimal point). Mirrors the server's rule (shared gradeSchema).
 */
export function parseGrade(text: string): { grade: number | null } | { error: string } {
  const t = text.trim().replace(',', '.');
  if (t === '') return { grade: null };
  if (!/^\d{1,2}(\.\d)?$/.test(t) && !/^\d{1,2}\.$/.test(t)) {
    return /^\d{1,2}\.\d{2,}$/.test(t)
      ? { error: 'Use at most one decimal, for example 7.2 or 7.3' }
      : { error: `Enter a grade from ${GRADE_MIN.toFixed(1)} to ${GRADE_MAX.toFixed(1)}` };
  }
  const g = Number(t);
  if (g < GRADE_MIN || g > GRADE_MAX) return { error: `Enter a grade from ${GRADE_MIN.toFixed(1)} to ${GRADE_MAX.toFixed(1)}` };
  return { grade: Math.round(g * 10) / 10 };
}

/**
 * Saves one review on its own: edits wait for a quiet moment (or a blur), one save runs at a
 * time with the version last read, and a failed save stays visible and retries by itself with
 * growing waits until it succeeds or the person retries by hand. Refusals that retrying cannot
 * fix (a bad value, a locked review, a change made elsewhere) stop and say so.
 */
export class ReviewSaver {
  readonly status;
  /** The sentence shown beside the row when something went wrong. */
  readonly message = signal<string | null>(null);
  /** The review as last confirmed by the server. */
  readonly row;

  private draft: ReviewDraft;
  private dirty = false;
  private inFlight: Subscription | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private attempt = 0;

  constructor(
    private readonly initial: MyReviewRow,
    private readonly send: (input: SaveReviewInput) => Observable<MyReviewRow>,
    private readonly onSaved: (row: MyReviewRow) => void = () => undefined,
  ) {
    this.row = signal<MyReviewRow>(initial);
    this.status = signal<SaveStatus>(initial.locked ? 'locked' : 'idle');
    this.draft = {
      grade: initial.grade,
      strengths: initial.strengths,
      weaknesses: initial.weaknesses,
      committeeNote: initial.committeeNote,
    };
  }

  /** The values being edited (what the next save sends). */
  current(): ReviewDraft {
    return { ...this.draft };
  }

  /** Takes an edit; saves after a quiet moment. */
  edit(change: Partial<ReviewDraft>): void {
    if (this.status() === 'locked') return;
    this.draft = { ...this.draft, ...change };
    this.dirty = true;
    this.attempt = 0;
    this.status.set('pending');
    this.message.set(null);
    this.schedule(SAVE_DEBOUNCE_MS);
  }

  /** Marks the typed grade as unusable: nothing is sent until it is fixed. */
  invalid(message: string): void {
    this.clearTimer();
    this.dirty = false;
    this.status.set('invalid');
    this.message.set(message);
  }

  /** Saves now if anything is waiting (on blur, on Enter). */
  flush(): void {
    if (this.dirty && !this.inFlight) {
      this.clearTimer();
      this.run();
    }
  }

  /** The retry button: at once, with a fresh count of waits. */
  retry(): void {
    this.attempt = 0;
    this.dirty = true;
    this.clearTimer();
    if (!this.inFlight) this.run();
  }

  /** Stops timers and the request in flight (the page is leaving). */
  destroy(): void {
    this.clearTimer();
    this.inFlight?.unsubscribe();
    this.inFlight = null;
  }

  private schedule(ms: number): void {
    this.clearTimer();
    this.timer = setTimeout(() => {
      this.timer = null;
      if (this.inFlight) {
        this.schedule(ms);
        return;
      }
      this.run();
    }, ms);
  }

  private clearTimer(): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
  }

  private run(): void {
    this.dirty = false;
    this.status.set('saving');
    const sent = this.current();
    this.inFlight = this.send({ version: this.row().version, ...sent }).subscribe({
      next: (saved) => {
        this.inFlight = null;
        this.attempt = 0;
        this.row.set(saved);
        this.onSaved(saved);
        if (this.dirty) {
          this.status.set('pending');
          this.schedule(SAVE_DEBOUNCE_MS);
        } else {
          this.status.set('saved');
          this.message.set(null);
        }
      },
      error: (err: unknown) => {
        this.inFlight = null;
        this.fail(err);
      },
    });
  }

  private fail(err: unknown): void {
    const body = readApiError(err) as ReturnType<typeof readApiError> & { current?: MyReviewRow };
    const status = err instanceof HttpErrorResponse ? err.status : 0;
    if (status === 409 && body.code === 'version_conflict' && body.current) {
      // Another tab saved first: show what is stored, keep nothing of ours silently.
      const current = body.current;
      this.row.set(current);
      this.draft = {
        grade: current.grade,
        strengths: current.strengths,
        weaknesses: current.weaknesses,
        committeeNote: current.committeeNote,
      };
      this.onSaved(current);
      this.status.set('conflict');
      this.message.set('This review was changed in another window; the saved version is shown. Enter your change again.');
      return;
    }
    if (status === 409 && body.code === 'review_locked') {
      this.status.set('locked');
      this.message.set(body.message);
      return;
    }
    if (status === 400 || status === 404) {
      this.status.set('invalid');
      this.message.set(body.message);
      return;
    }
    // Unreachable server, 5xx, session trouble: keep the edit and try again later.
    this.dirty = true;
    this.attempt++;
    const wait = retryDelayMs(this.attempt);
    this.status.set('failed');
    this.message.set(`Not saved: ${body.message} Trying again in ${Math.round(wait / 1000)} s.`);
    this.schedule(wait);
  }
}
