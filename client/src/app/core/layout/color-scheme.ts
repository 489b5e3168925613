import { MediaMatcher } from '@angular/cdk/layout';
import { DestroyRef, DOCUMENT, effect, inject, Injectable, signal, computed } from '@angular/core';

export type Scheme = 'light' | 'dark';

export const SCHEME_STORAGE_KEY = 'spincycle.color-scheme';

/**
 * Light or dark. The theme's colours are `light-dark()` pairs, so the scheme is just the
 * CSS `color-scheme` of <html>: it follows the operating system until the person picks one
 * with the top-bar toggle; the choice is kept in localStorage.
 */
@Injectable({ providedIn: 'root' })
export class ColorScheme {
  private readonly root = inject(DOCUMENT).documentElement;
  private readonly systemQuery = inject(MediaMatcher).matchMedia('(prefers-color-scheme: dark)');
  private readonly systemDark = signal(this.systemQuery.matches);
  private readonly chosen = signal<Scheme | null>(readStoredScheme());

  /** The scheme in use. */
  readonly scheme = computed<Scheme>(() => this.chosen() ?? (this.systemDark() ? 'dark' : 'light'));
  readonly isDark = computed(() => this.scheme() === 'dark');
  /** True while the scheme follows the operating system. */
  readonly followsSystem = computed(() => this.chosen() === null);

  constructor() {
    const onSystemChange = (event: MediaQueryListEvent) => this.systemDark.set(event.matches);
    this.systemQuery.addEventListener?.('change', onSystemChange);
    inject(DestroyRef).onDestroy(() => this.systemQuery.removeEventListener?.('change', onSystemChange));
    this.apply(this.chosen());
    effect(() => this.apply(this.chosen()));
  }

  /** Switches to the other scheme and remembers the choice. */
  toggle(): void {
    const next: Scheme = this.isDark() ? 'light' : 'dark';
    this.chosen.set(next);
    writeStoredScheme(next);
  }

  /** Forgets the choice and follows the operating system again. */
  followSystem(): void {
    this.chosen.set(null);
    writeStoredScheme(null);
  }

  private apply(chosen: Scheme | null): void {
    this.root.classList.toggle('scheme-light', chosen === 'light');
    this.root.classList.toggle('scheme-dark', chosen === 'dark');
  }
}

function readStoredScheme(): Scheme | null {
  try {
    const stored = globalThis.localStorage?.getItem(SCHEME_STORAGE_KEY);
    return stored === 'light' || stored === 'dark' ? stored : null;
  } catch {
    return null; // storage disabled: follow the system
  }
}

function writeStoredScheme(scheme: Scheme | null): void {
  try {
    if (scheme) globalThis.localStorage?.setItem(SCHEME_STORAGE_KEY, scheme);
    else globalThis.localStorage?.removeItem(SCHEME_STORAGE_KEY);
  } catch {
    // storage disabled: the choice lasts for this page only
  }
}
