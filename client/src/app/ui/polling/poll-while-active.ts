import { effect, type WritableSignal } from '@angular/core';
import type { Observable } from 'rxjs';

export interface PollWhileActive<S> {
  /** The status shown; each answer is written here. */
  status: WritableSignal<S | null>;
  /** What to ask about (null: nothing yet). */
  id: () => number | null;
  /** Whether the status is still on its way (queued or running). */
  active: (status: S | null) => boolean;
  fetch: (id: number) => Observable<S>;
  pauseMs: number;
  /** Called once when an answer says the work has ended (e.g. reload the results). */
  finished: () => void;
}

/**
 * While a background job is active, asks for its status after every pause: each answer sets the
 * status, which re-runs the effect and schedules the next request; when an answer says the job
 * has ended, `finished` runs once. The cleanup cancels the timer or the request when the status
 * changes otherwise (a new job) or the component goes. A failed request is tried again after the
 * same pause. Call in an injection context (a constructor or field initialiser).
 */
export function pollWhileActive<S extends object>(options: PollWhileActive<S>): void {
  effect((onCleanup) => {
    const current = options.status();
    const id = options.id();
    if (!options.active(current) || id === null) return;
    let request: { unsubscribe(): void } | undefined;
    const timer = setTimeout(() => {
      request = options.fetch(id).subscribe({
        next: (status) => {
          options.status.set(status);
          if (!options.active(status)) options.finished();
        },
        error: () => options.status.set({ ...current! }),
      });
    }, options.pauseMs);
    onCleanup(() => {
      clearTimeout(timer);
      request?.unsubscribe();
    });
  });
}
