import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, LOCALE_ID, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { fileSizeProblem } from './file-size';

/** A check of a chosen file beyond its size: the sentence that says why it cannot be sent, or null. */
export type FileCheck = (file: File) => string | null;

/**
 * Chooses one file to upload. The native `<input type=file>` stays hidden: a Material button
 * opens its chooser (a real `<button>`, so Enter and Space work as on any button), the chosen
 * file's name describes the button, and a file larger than `maxBytes` (or refused by `check`)
 * is not taken, with a sentence saying why. The picker does not upload: its owner keeps the
 * file from `fileChange`, sends it, and sets `file` back to null once it is stored.
 *
 * `testId` names the parts for tests and links them: `<testId>-input`, `choose-<testId>`,
 * `<testId>-file-name` (also the id the button's description points to) and
 * `<testId>-problem`; keep it unique on the page.
 */
@Component({
  selector: 'app-file-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatIcon],
  template: `
    <div class="picker">
      <input
        #native
        type="file"
        hidden
        [accept]="accept()"
        [disabled]="disabled()"
        (change)="choose(native)"
        [attr.aria-label]="label()"
        [attr.data-testid]="testId() + '-input'"
      />
      <button
        matButton="outlined"
        type="button"
        (click)="native.click()"
        [disabled]="disabled()"
        [attr.aria-describedby]="describedByIds()"
        [attr.data-testid]="'choose-' + testId()"
      >
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">attach_file</mat-icon>
        {{ buttonText() }}
      </button>
      <span
        [id]="testId() + '-file-name'"
        class="file-name"
        [class.none]="!chosen()"
        [attr.data-testid]="testId() + '-file-name'"
        [attr.title]="chosen()?.name"
      >
        {{ chosen()?.name ?? 'No file chosen' }}
      </span>
    </div>
    @if (description()) {
      <p class="description" [id]="testId() + '-description'">{{ description() }}</p>
    }
    @if (problem(); as problem) {
      <p class="problem" role="alert" [id]="testId() + '-problem'" [attr.data-testid]="testId() + '-problem'">{{ problem }}</p>
    }
  `,
  styles: `
    :host {
      display: flex;
      flex-direction: column;
      gap: 4px;
      min-inline-size: 0;
      max-inline-size: 100%;
    }
    .picker {
      display: flex;
      align-items: center;
      gap: 12px;
      min-inline-size: 0;
    }
    .file-name {
      min-inline-size: 0;
      max-inline-size: 40ch;
      overflow: hidden;
      text-overflow: ellipsis;
      white-space: nowrap;
    }
    .file-name.none,
    .description {
      color: var(--mat-sys-on-surface-variant);
    }
    .description,
    .problem {
      margin: 0;
      font: var(--mat-sys-body-small);
      max-inline-size: 80ch;
    }
    .problem {
      color: var(--mat-sys-error);
    }
  `,
})
export class FilePicker {
  private readonly locale = inject(LOCALE_ID);

  /** The `accept` of the chooser: extensions and media types, e.g. `.csv,text/csv`. */
  readonly accept = input.required<string>();
  /** What the file is, as the button says it: "CSV file" → "Choose a CSV file", "Choose another CSV file". */
  readonly label = input.required<string>();
  /** Largest file taken, in bytes (null: any size; the server's own limit still holds). */
  readonly maxBytes = input<number | null>(null);
  /** A sentence under the button about the file it expects; it also describes the button. */
  readonly description = input('');
  /** Ids of elements elsewhere on the page that describe the file (a list of columns…). */
  readonly describedBy = input('');
  /** A further check of a chosen file, after its size (its type, its emptiness). */
  readonly check = input<FileCheck | null>(null);
  /** While an upload is on its way: nothing can be chosen. */
  readonly disabled = input(false);
  /** Prefix of the parts' test ids and element ids (see the class comment). */
  readonly testId = input.required<string>();
  /** The chosen file as its owner holds it: set it to null (after an upload) to clear the picker. */
  readonly file = input<File | null>(null);
  /** Each choice: the file taken, or null when the file chosen was refused (the picker says why). */
  readonly fileChange = output<File | null>();

  /** The file shown: the owner's, until the next choice. */
  protected readonly chosen = linkedSignal(() => this.file());

  /** Why the last file chosen was not taken. */
  protected readonly problem = signal<string | null>(null);

  protected readonly buttonText = computed(() => {
    const label = this.label();
    if (this.chosen()) return `Choose another ${label}`;
    return `Choose ${/^[aeiou]/i.test(label) ? 'an' : 'a'} ${label}`;
  });

  protected readonly describedByIds = computed(() => {
    const id = this.testId();
    const ids = [`${id}-file-name`];
    if (this.problem()) ids.push(`${id}-problem`);
    if (this.description()) ids.push(`${id}-description`);
    if (this.describedBy()) ids.push(this.describedBy());
    return ids.join(' ');
  });

  protected choose(native: HTMLInputElement): void {
    const chosen = native.files && native.files.length ? native.files[0] : null;
    // The chosen file lives in `file`: clearing the native input lets the same file be chosen again.
    native.value = '';
    if (!chosen) return;
    const max = this.maxBytes();
    const problem = (max === null ? null : fileSizeProblem(chosen, max, this.locale)) ?? this.check()?.(chosen) ?? null;
    const taken = problem ? null : chosen;
    this.problem.set(problem);
    this.chosen.set(taken);
    this.fileChange.emit(taken);
  }
}
