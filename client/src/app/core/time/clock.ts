import { DestroyRef, inject, Injectable, signal } from '@angular/core';

/** How often countdowns move on; a minute is finer than any deadline we show. */
const TICK_MS = 30_000;

/** The current time as a signal, so that countdowns update without a page reload. */
@Injectable({ providedIn: 'root' })
export class Clock {
  private readonly tick = signal(Date.now());
  /** Milliseconds since the epoch, refreshed every 30 s. */
  readonly now = this.tick.asReadonly();

  constructor() {
    const id = setInterval(() => this.tick.set(Date.now()), TICK_MS);
    inject(DestroyRef).onDestroy(() => clearInterval(id));
  }
}
