import { COMMA, ENTER } from '@angular/cdk/keycodes';
import { ChangeDetectionStrategy, Component, computed, ElementRef, inject, linkedSignal, signal, viewChild } from '@angular/core';
import { MatAutocomplete, MatAutocompleteSelectedEvent, MatAutocompleteTrigger } from '@angular/material/autocomplete';
import { MatButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatChipGrid, MatChipInput, MatChipInputEvent, MatChipRemove, MatChipRow } from '@angular/material/chips';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { expertiseSchema } from '@spincycle/shared/review/panels';
import type { ApiErrorBody } from '@spincycle/shared/http/api-error';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { ReviewingApi } from '../reviewing-api';

type SaveState = 'idle' | 'saving' | 'saved' | 'failed';

const lower = (s: string) => s.toLowerCase();
const capitalise = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/**
 * One sentence for a problem with the list, naming the entry when there is one:
 * path `expertise.3` → "“Open clusters” is listed twice."; path `expertise` → "At most 20 categories."
 */
function entryMessage(list: readonly string[], path: string, message: string): string {
  const match = /^expertise\.(\d+)$/.exec(path);
  const entry = match ? list[Number(match[1])] : undefined;
  if (entry !== undefined) return `“${entry.trim() || '(empty)'}” ${message}.`;
  return `${capitalise(message)}.`;
}

/** The first problem the shared schema finds in a list (the same words the server would send), or null. */
function checkList(list: readonly string[]): string | null {
  const result = expertiseSchema.safeParse({ expertise: list });
  if (result.success) return null;
  const issue = result.error.issues[0];
  return issue ? entryMessage(list, issue.path.join('.'), issue.message) : 'Check your categories.';
}

/**
 * "Your expertise" on the reviewer's page: the categories the reviewer knows, as removable
 * chips with suggestions from the cycles' categories, saved with one button. The facility's
 * automatic assignment prefers reviewers whose expertise matches a proposal's category.
 */
@Component({
  selector: 'app-expertise-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    MatAutocomplete,
    MatAutocompleteTrigger,
    MatButton,
    MatCard,
    MatChipGrid,
    MatChipInput,
    MatChipRemove,
    MatChipRow,
    MatFormField,
    MatHint,
    MatIcon,
    MatLabel,
    MatOption,
  ],
  template: `
    <mat-card appearance="outlined" class="expertise" data-testid="expertise-card">
      <section aria-labelledby="expertise-title">
        <h2 id="expertise-title">Your expertise</h2>
        <p class="why">The facility prefers reviewers whose expertise matches a proposal's category when it assigns reviewers.</p>

        <app-load-status
          [loading]="data.isLoading()"
          loadingLabel="Loading your expertise"
          [error]="loadError()"
          [empty]="listedNone()"
          emptyText="You have not listed any categories yet."
          (retry)="data.reload()"
        />

        @if (data.hasValue()) {
          <mat-form-field class="field" subscriptSizing="dynamic">
            <mat-label>Categories you know</mat-label>
            <mat-chip-grid #grid aria-label="Categories you know" [disabled]="saveState() === 'saving'">
              @for (name of chosen(); track lower(name)) {
                <mat-chip-row (removed)="remove(name)">
                  {{ name }}
                  <button matChipRemove type="button" [attr.aria-label]="'Remove ' + name">
                    <mat-icon fontSet="material-symbols-outlined">cancel</mat-icon>
                  </button>
                </mat-chip-row>
              }
            </mat-chip-grid>
            <!-- A sibling of the grid, not a child: a grid may hold only rows (WAI-ARIA). -->
            <input
              #entry
              placeholder="Add a category…"
              data-testid="expertise-input"
              [matChipInputFor]="grid"
              [matChipInputSeparatorKeyCodes]="separatorKeys"
              [matAutocomplete]="auto"
              (matChipInputTokenEnd)="addTyped($event)"
              (input)="onText(entry.value)"
            />
            <mat-autocomplete #auto="matAutocomplete" (optionSelected)="addSelected($event)">
              @for (s of options(); track s) {
                <mat-option [value]="s">{{ s }}</mat-option>
              }
            </mat-autocomplete>
            @if (fieldError(); as message) {
              <mat-hint class="field-error" role="alert" data-testid="expertise-error">{{ message }}</mat-hint>
            } @else {
              <mat-hint>Pick a suggestion or type a category, then press Enter</mat-hint>
            }
          </mat-form-field>

          <div class="actions">
            <button
              matButton="filled"
              type="button"
              data-testid="expertise-save"
              [disabled]="!dirty() || saveState() === 'saving'"
              (click)="save()"
            >
              Save
            </button>
            <span class="status" [class.status-error]="saveState() === 'failed'" aria-live="polite" data-testid="expertise-status">{{
              statusText()
            }}</span>
          </div>
        }
      </section>
    </mat-card>
  `,
  styles: `
    .expertise {
      margin: 0 0 16px;
      padding: 12px 16px;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 4px;
    }
    .why {
      margin: 0 0 8px;
      color: var(--mat-sys-on-surface-variant);
    }
    .field {
      inline-size: 100%;
    }
    .field-error {
      color: var(--mat-sys-error);
    }
    .actions {
      display: flex;
      align-items: center;
      gap: 12px;
      margin-block-start: 8px;
    }
    .status {
      color: var(--mat-sys-on-surface-variant);
    }
    .status-error {
      color: var(--mat-sys-error);
    }
  `,
})
export class ExpertiseCard {
  private readonly api = inject(ReviewingApi);
  private readonly entry = viewChild<ElementRef<HTMLInputElement>>('entry');

  protected readonly data = this.api.expertiseResource();
  protected readonly separatorKeys = [ENTER, COMMA] as const;
  protected readonly lower = lower;

  /** The list as stored (as loaded, then as last saved). */
  private readonly stored = computed(() => (this.data.hasValue() ? this.data.value().expertise : []));
  /** The list as edited; starts again from the stored one whenever that changes. */
  protected readonly chosen = linkedSignal(() => [...this.stored()]);
  protected readonly text = signal('');
  /** The problem with the list or the typed entry, naming the entry. */
  protected readonly fieldError = signal<string | null>(null);
  protected readonly saveState = signal<SaveState>('idle');
  /** The server's sentence when a save was refused for a reason other than an entry. */
  private readonly saveMessage = signal<string | null>(null);

  protected readonly loadError = computed(() => loadErrorText(this.data.error(), 'Your expertise could not be loaded.'));
  protected readonly listedNone = computed(() => this.data.hasValue() && this.stored().length === 0 && this.chosen().length === 0);
  protected readonly dirty = computed(() => {
    const a = this.chosen();
    const b = this.stored();
    return a.length !== b.length || a.some((x, i) => x !== b[i]);
  });
  /** Suggestions not yet chosen (ignoring case) that contain the typed text. */
  protected readonly options = computed(() => {
    const q = lower(this.text().trim());
    const taken = new Set(this.chosen().map(lower));
    const suggestions = this.data.hasValue() ? this.data.value().suggestions : [];
    return suggestions.filter((s) => !taken.has(lower(s)) && lower(s).includes(q));
  });
  protected readonly statusText = computed(() => {
    switch (this.saveState()) {
      case 'saving':
        return 'Saving…';
      case 'saved':
        return 'Saved.';
      case 'failed':
        return this.saveMessage() ?? 'Not saved.';
      default:
        return this.dirty() ? 'Not saved yet.' : '';
    }
  });

  protected onText(value: string): void {
    this.text.set(value);
  }

  /**
   * Enter or a comma in the input. Enter on a highlighted suggestion is handled first by the
   * autocomplete, which picks it and empties the input, so nothing is added twice.
   */
  protected addTyped(event: MatChipInputEvent): void {
    this.add(event.value);
  }

  protected addSelected(event: MatAutocompleteSelectedEvent): void {
    this.add(String(event.option.value));
    event.option.deselect();
  }

  protected remove(name: string): void {
    this.chosen.update((list) => list.filter((n) => n !== name));
    this.edited();
  }

  protected save(): void {
    const list = this.chosen();
    const problem = checkList(list);
    if (problem) {
      this.fieldError.set(problem);
      return;
    }
    this.saveState.set('saving');
    this.saveMessage.set(null);
    this.fieldError.set(null);
    this.api.saveExpertise({ expertise: list }).subscribe({
      next: (answer) => {
        this.data.set(answer);
        this.saveState.set('saved');
      },
      error: (err: unknown) => {
        const body = readApiError(err);
        this.fieldError.set(this.entryErrors(list, body));
        this.saveMessage.set(`Not saved. ${body.message}`);
        this.saveState.set('failed');
      },
    });
  }

  /** A typed or picked name, written as the suggestion spells it when it matches one ignoring case. */
  private add(raw: string): void {
    const value = raw.trim();
    if (!value) {
      this.clearEntry();
      return;
    }
    const suggestions = this.data.hasValue() ? this.data.value().suggestions : [];
    const name = suggestions.find((s) => lower(s) === lower(value)) ?? value;
    if (this.chosen().some((n) => lower(n) === lower(name))) {
      this.fieldError.set(`“${name}” is already in your list.`);
      return;
    }
    const next = [...this.chosen(), name];
    const problem = checkList(next);
    if (problem) {
      this.fieldError.set(problem);
      return;
    }
    this.chosen.set(next);
    this.clearEntry();
    this.edited();
  }

  private clearEntry(): void {
    const input = this.entry()?.nativeElement;
    if (input) input.value = '';
    this.text.set('');
  }

  private edited(): void {
    this.fieldError.set(null);
    if (this.saveState() !== 'saving') this.saveState.set('idle');
  }

  /** The server's field errors as sentences naming the entries, or null when it sent none. */
  private entryErrors(list: readonly string[], body: ApiErrorBody): string | null {
    const sentences = Object.entries(body.fieldErrors ?? {})
      .filter(([path]) => path === 'expertise' || path.startsWith('expertise.'))
      .map(([path, messages]) => entryMessage(list, path, messages.join('; ')));
    return sentences.length ? sentences.join(' ') : null;
  }
}
