import { HttpErrorResponse } from '@angular/common/http';
import { computed, DestroyRef, inject, Injectable, signal } from '@angular/core';
import { isEditableState } from '@spincycle/shared/proposals/proposal-states';
import { completenessSchema, type Proposal, type UpdateProposalInput } from '@spincycle/shared/proposals/proposal-schemas';
import { readApiError } from '../../core/http/api-error-message';
import { ProposalApi } from './proposal-api';

/** Pause after the last keystroke before the overview is saved. */
export const AUTOSAVE_DEBOUNCE_MS = 800;

/** The fields of the overview tab, as autosave sends them. */
export interface OverviewValues {
  title: string;
  abstract: string;
  category: string | null;
  nodeIds: number[];
  /** Probability that each plan recovers the period, as a fraction; null while the field is empty. */
  completeness: number | null;
}

export type SaveState = 'idle' | 'pending' | 'saving' | 'saved' | 'error' | 'conflict';

/** The values of the overview as stored on the server. */
export function overviewOf(proposal: Proposal): OverviewValues {
  return {
    title: proposal.title,
    abstract: proposal.abstract,
    category: proposal.category,
    nodeIds: [...proposal.nodeIds],
    completeness: proposal.completeness,
  };
}

/** The fields of `next` that differ from `base` (node ids compared as sets). */
export function changedFields(base: OverviewValues, next: OverviewValues): Partial<OverviewValues> {
  const changes: Partial<OverviewValues> = {};
  if (next.title !== base.title) changes.title = next.title;
  if (next.abstract !== base.abstract) changes.abstract = next.abstract;
  if (next.category !== base.category) changes.category = next.category;
  const a = [...base.nodeIds].sort((x, y) => x - y).join(',');
  const b = [...next.nodeIds].sort((x, y) => x - y).join(',');
  if (a !== b) changes.nodeIds = [...next.nodeIds];
  if (next.completeness !== base.completeness) changes.completeness = next.completeness;
  return changes;
}

/**
 * The proposal open in the editor, shared by its tabs (one instance per editor, provided by
 * ProposalEditor). Holds the server's copy, and the overview's autosave: edits are debounced,
 * sent one PATCH at a time with the version they were based on, and never sent again after a
 * 409 until the person reloads (what they typed stays in `draft`, so nothing is overwritten
 * on either side).
 */
@Injectable()
export class ProposalStore {
  private readonly api = inject(ProposalApi);

  /** The id from the route; null until the editor sets it. */
  readonly id = signal<number | null>(null);
  readonly resource = this.api.proposalResource(() => this.id());
  readonly proposal = computed<Proposal | null>(() => (this.resource.hasValue() ? this.resource.value() : null));

  readonly isPi = computed(() => this.proposal()?.myRole === 'pi');
  /** Submitted, past the call, or otherwise closed to edits: every tab shows and keeps, but changes nothing. */
  readonly readOnly = computed(() => {
    const proposal = this.proposal();
    return !proposal || !proposal.editable || !isEditableState(proposal.state);
  });

  // ---- overview autosave -------------------------------------------------------------------

  /** What the person typed and the server has not stored yet (kept across tab changes). */
  readonly draft = signal<OverviewValues | null>(null);
  readonly saveState = signal<SaveState>('idle');
  readonly savedAt = signal<Date | null>(null);
  /** Why the last save failed (not a conflict), with the server's per-field messages. */
  readonly saveError = signal<{ message: string; fieldErrors?: Record<string, string[]> } | null>(null);
  /** The server's message after a 409: the overview is stale and autosave is stopped until a reload. */
  readonly conflict = signal<string | null>(null);
  /** Counts explicit reloads, so that the overview refills its form from the server's copy. */
  readonly reloads = signal(0);

  /** The overview values and version the current draft is based on. */
  private base: { values: OverviewValues; version: number } | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private inFlight = false;

  constructor() {
    // Leaving the editor while a save waits for its debounce: send it now rather than lose it.
    // (The answer then lands nowhere: a destroyed resource ignores set().)
    inject(DestroyRef).onDestroy(() => {
      if (this.timer !== null) this.flush();
      this.clearTimer();
    });
  }

  /** The version the overview form was filled from (or last saved as). */
  get baseVersion(): number | null {
    return this.base?.version ?? null;
  }

  /** Called by the overview when it fills its form from the server's copy. */
  rebase(proposal: Proposal): void {
    this.base = { values: overviewOf(proposal), version: proposal.version };
  }

  /** Replaces the server's copy after a write that returned the proposal. */
  replace(proposal: Proposal): void {
    this.resource.set(proposal);
  }

  /** Fetches the proposal again quietly (after a change elsewhere: targets, plans, justification). */
  refresh(): void {
    this.resource.reload();
  }

  /** The person chose to reload: drop the stale draft and the conflict, fetch the server's copy. */
  reload(): void {
    this.clearTimer();
    this.draft.set(null);
    this.conflict.set(null);
    this.saveError.set(null);
    this.saveState.set('idle');
    this.base = null;
    this.reloads.update((n) => n + 1);
    this.resource.reload();
  }

  /** Records an edit of the overview and schedules its save. */
  edit(values: OverviewValues): void {
    this.draft.set(values);
    if (this.conflict()) return;
    this.saveState.set('pending');
    this.clearTimer();
    this.timer = setTimeout(() => this.flush(), AUTOSAVE_DEBOUNCE_MS);
  }

  /** Sends the draft now (also used to retry after a failure). */
  flush(): void {
    this.clearTimer();
    const draft = this.draft();
    const id = this.id();
    if (!draft || id === null || !this.base || this.conflict() || this.inFlight) return;
    const { completeness, ...changes } = changedFields(this.base.values, draft);
    // A field the server would refuse waits (the form says why) while the rest saves: an
    // emptied title (required), a completeness that is empty or out of range.
    const held: string[] = [];
    if (changes.title !== undefined && changes.title.trim() === '') {
      delete changes.title;
      held.push('Give the proposal a title to save it.');
    }
    const input: UpdateProposalInput = { version: this.base.version, ...changes };
    if (completeness !== undefined) {
      const checked = completenessSchema.safeParse(completeness);
      if (checked.success) input.completeness = checked.data;
      else {
        const message = checked.error.issues[0].message;
        held.push(`${message.charAt(0).toUpperCase()}${message.slice(1)} to save it.`);
      }
    }
    const sent: Partial<OverviewValues> = { ...changes, ...(input.completeness !== undefined ? { completeness: input.completeness } : {}) };
    if (Object.keys(sent).length === 0) {
      if (held.length) {
        this.saveError.set({ message: held.join(' ') });
        this.saveState.set('error');
      } else {
        this.draft.set(null);
        this.saveState.set(this.savedAt() ? 'saved' : 'idle');
      }
      return;
    }
    this.inFlight = true;
    this.saveState.set('saving');
    this.saveError.set(null);
    this.api.update(id, input).subscribe({
      next: (stored) => {
        this.inFlight = false;
        this.base = { values: { ...this.base!.values, ...sent }, version: stored.version };
        this.replace(stored);
        this.savedAt.set(new Date());
        const latest = this.draft();
        if (latest && Object.keys(changedFields(this.base.values, latest)).length > 0) {
          // Typed on while this save travelled: save the rest.
          this.edit(latest);
        } else {
          this.draft.set(null);
          this.saveState.set('saved');
        }
      },
      error: (error: unknown) => {
        this.inFlight = false;
        const body = readApiError(error);
        if (error instanceof HttpErrorResponse && error.status === 409) {
          this.conflict.set(body.message);
          this.saveState.set('conflict');
        } else {
          this.saveError.set({ message: body.message, fieldErrors: body.fieldErrors });
          this.saveState.set('error');
        }
      },
    });
  }

  private clearTimer(): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
  }
}
