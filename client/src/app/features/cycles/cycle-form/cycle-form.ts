import { COMMA, ENTER } from '@angular/cdk/keycodes';
import { DatePipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatChipGrid, MatChipInput, MatChipInputEvent, MatChipRemove, MatChipRow } from '@angular/material/chips';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { cycleInputSchema, type CycleInput } from '@spincycle/shared/cycles/cycle-schemas';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import { map } from 'rxjs';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { CycleAdminApi } from '../cycle-admin-api';
import { joinUtcInstant, splitUtcInstant } from '../utc-instant';

type NodeRow = FormGroup<{
  nodeId: FormControl<number | null>;
  nodeHoursAvailable: FormControl<number | null>;
}>;

/** Where an error about an API field is shown on this form (the instants have two inputs each). */
const FIELD_TO_CONTROL: Record<string, string> = {
  callOpensAt: 'callOpensDate',
  callClosesAt: 'callClosesDate',
};

/**
 * Re-keys `fieldErrors` (from the server, whose PUT paths start with `cycle.`, or from the
 * shared schema on this side) to the paths of this form's controls. Errors about the node
 * list as a whole come back under `nodes`, shown above the rows.
 */
export function toFormErrorPaths(fieldErrors: Record<string, string[]> | undefined): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [path, messages] of Object.entries(fieldErrors ?? {})) {
    let key = path.replace(/^cycle\./, '');
    const head = key.split('.')[0];
    if (FIELD_TO_CONTROL[head]) key = FIELD_TO_CONTROL[head];
    if (head === 'categories') key = 'categories';
    (out[key] ??= []).push(...messages);
  }
  return out;
}

/**
 * Creates a cycle (/cycles/new) or edits one (/cycles/:id). The call's instants are typed as
 * a UTC date and time with the person's local equivalent shown beside them. Saving an edit
 * sends the version read; when someone else saved in between, the form keeps what was typed
 * and offers to reload.
 */
@Component({
  selector: 'app-cycle-form',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DatePipe,
    LoadStatus,
    MatButton,
    MatChipGrid,
    MatChipInput,
    MatChipRemove,
    MatChipRow,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatIconButton,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    MatSlideToggle,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './cycle-form.html',
  styleUrl: './cycle-form.scss',
})
export default class CycleForm {
  private readonly api = inject(CycleAdminApi);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);

  /** Route parameter (absent on /cycles/new). */
  readonly id = input<string>();
  protected readonly cycleId = computed(() => {
    const raw = this.id();
    return raw === undefined ? null : Number(raw);
  });
  protected readonly isNew = computed(() => this.cycleId() === null);

  protected readonly cycle = this.api.cycleResource(() => {
    const id = this.cycleId();
    return id !== null && Number.isInteger(id) && id > 0 ? id : null;
  });
  protected readonly nodes = this.api.nodesResource();
  protected readonly nodeList = computed(() => (this.nodes.hasValue() ? this.nodes.value() : []));

  protected readonly localZone = Intl.DateTimeFormat().resolvedOptions().timeZone;
  protected readonly separatorKeys = [ENTER, COMMA] as const;
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    code: new FormControl('', { nonNullable: true, validators: [zodValidator(fieldSchema('code'))] }),
    title: new FormControl('', { nonNullable: true, validators: [zodValidator(fieldSchema('title'))] }),
    callOpensDate: new FormControl('', { nonNullable: true }),
    callOpensTime: new FormControl('00:00', { nonNullable: true }),
    callClosesDate: new FormControl('', { nonNullable: true }),
    callClosesTime: new FormControl('23:59', { nonNullable: true }),
    campaignStart: new FormControl('', { nonNullable: true }),
    campaignEnd: new FormControl('', { nonNullable: true }),
    anonymousReview: new FormControl(false, { nonNullable: true }),
    categories: new FormControl<string[]>([], { nonNullable: true }),
    nodes: new FormArray<NodeRow>([]),
  });

  private readonly value = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue())), {
    initialValue: this.form.getRawValue(),
  });
  protected readonly opensAt = computed(() => joinUtcInstant(this.value().callOpensDate, this.value().callOpensTime));
  protected readonly closesAt = computed(() => joinUtcInstant(this.value().callClosesDate, this.value().callClosesTime));
  protected readonly categories = computed(() => this.value().categories);

  protected readonly saving = signal(false);
  protected readonly serverError = signal<string | null>(null);
  /** Messages about the node list as a whole (e.g. "at least one node takes part"). */
  protected readonly nodesError = signal<string | null>(null);
  /** Set on 409: someone else saved this cycle after it was read. Saving stays off until a reload. */
  protected readonly conflict = signal<string | null>(null);
  private version: number | null = null;

  protected readonly loadError = computed(() => {
    const id = this.cycleId();
    if (id !== null && !(Number.isInteger(id) && id > 0)) return 'There is no cycle at this address.';
    return loadErrorText(this.cycle.error(), 'The cycle could not be loaded.');
  });
  protected readonly nodesLoadError = computed(() => loadErrorText(this.nodes.error(), 'The nodes could not be loaded.'));
  protected readonly ready = computed(() => this.isNew() || this.cycle.hasValue());

  constructor() {
    if (this.form.controls.nodes.length === 0) this.addNode();
    // Fill the form whenever the server's copy arrives (first load, and the reload after a conflict).
    effect(() => {
      if (!this.cycle.hasValue()) return;
      const cycle = this.cycle.value();
      untracked(() => this.fill(cycle));
    });
  }

  protected addNode(): void {
    this.form.controls.nodes.push(
      new FormGroup({
        nodeId: new FormControl<number | null>(null),
        nodeHoursAvailable: new FormControl<number | null>(null),
      }),
    );
  }

  protected removeNode(index: number): void {
    this.form.controls.nodes.removeAt(index);
  }

  protected addCategory(event: MatChipInputEvent): void {
    const value = event.value.trim();
    const control = this.form.controls.categories;
    if (value && !control.value.includes(value)) control.setValue([...control.value, value]);
    control.markAsTouched();
    event.chipInput.clear();
  }

  protected removeCategory(category: string): void {
    const control = this.form.controls.categories;
    control.setValue(control.value.filter((c) => c !== category));
    control.markAsTouched();
  }

  protected reload(): void {
    this.cycle.reload();
  }

  protected submit(): void {
    if (this.saving() || this.conflict()) return;
    this.serverError.set(null);
    this.nodesError.set(null);
    const parsed = cycleInputSchema.safeParse(this.toInput());
    if (!parsed.success) {
      const fieldErrors: Record<string, string[]> = {};
      // One message per field, the first the schema reports (as the field validators do), in
      // plain words when the field is simply empty.
      const values = this.form.getRawValue();
      for (const issue of parsed.error.issues) {
        const path = issue.path.join('.');
        fieldErrors[path] ??= [emptyFieldMessage(path, values) ?? issue.message];
      }
      this.showErrors(fieldErrors);
      this.form.markAllAsTouched();
      return;
    }
    const id = this.cycleId();
    const request =
      id === null ? this.api.create(parsed.data) : this.api.update(id, { version: this.version ?? 1, cycle: parsed.data });
    this.saving.set(true);
    request.subscribe({
      next: (saved) => {
        this.saving.set(false);
        this.snackBar.open(`Cycle ${saved.code} saved.`, 'Dismiss');
        void this.router.navigateByUrl('/cycles');
      },
      error: (error: unknown) => {
        this.saving.set(false);
        const body = readApiError(error);
        if (error instanceof HttpErrorResponse && error.status === 409) {
          this.conflict.set(body.message);
          return;
        }
        const unmatched = this.showErrors(body.fieldErrors);
        this.serverError.set([body.message, ...unmatched].join(' '));
      },
    });
  }

  /** Puts messages under their fields; returns those without a place on the form. */
  private showErrors(fieldErrors: Record<string, string[]> | undefined): string[] {
    const mapped = toFormErrorPaths(fieldErrors);
    const listMessages = mapped['nodes'];
    delete mapped['nodes'];
    if (listMessages) this.nodesError.set(listMessages.join(' '));
    return applyServerFieldErrors(this.form, mapped);
  }

  /** The form as the API's input; unparsable parts stay as they are so the schema names them. */
  private toInput(): Record<string, unknown> {
    const v = this.form.getRawValue();
    return {
      code: v.code,
      title: v.title,
      callOpensAt: joinUtcInstant(v.callOpensDate, v.callOpensTime) ?? '',
      callClosesAt: joinUtcInstant(v.callClosesDate, v.callClosesTime) ?? '',
      campaignStart: v.campaignStart,
      campaignEnd: v.campaignEnd,
      anonymousReview: v.anonymousReview,
      categories: v.categories,
      nodes: v.nodes.map((row) => ({ nodeId: row.nodeId, nodeHoursAvailable: row.nodeHoursAvailable })),
    } satisfies Record<keyof CycleInput, unknown>;
  }

  private fill(cycle: CycleSummary): void {
    this.version = cycle.version;
    this.conflict.set(null);
    this.serverError.set(null);
    this.nodesError.set(null);
    const opens = splitUtcInstant(cycle.callOpensAt);
    const closes = splitUtcInstant(cycle.callClosesAt);
    // Resize the rows rather than rebuild them, so that the rendered rows are kept.
    const nodes = this.form.controls.nodes;
    while (nodes.length > Math.max(1, cycle.nodes.length)) nodes.removeAt(nodes.length - 1, { emitEvent: false });
    while (nodes.length < cycle.nodes.length) this.addNode();
    this.form.patchValue({
      code: cycle.code,
      title: cycle.title,
      callOpensDate: opens.date,
      callOpensTime: opens.time,
      callClosesDate: closes.date,
      callClosesTime: closes.time,
      campaignStart: cycle.campaignStart,
      campaignEnd: cycle.campaignEnd,
      anonymousReview: cycle.anonymousReview,
      categories: [...cycle.categories],
      nodes: cycle.nodes.map((node) => ({ nodeId: node.nodeId, nodeHoursAvailable: node.nodeHoursAvailable })),
    });
    this.form.markAsPristine();
    this.form.markAsUntouched();
  }
}

/** The form values `emptyFieldMessage` looks at. */
interface EmptyCheckValues {
  callOpensDate: string;
  callOpensTime: string;
  callClosesDate: string;
  callClosesTime: string;
  campaignStart: string;
  campaignEnd: string;
  nodes: { nodeId: number | null; nodeHoursAvailable: number | null }[];
}

/** What to say about a field left empty (the schema's own words describe wrong formats). */
export function emptyFieldMessage(path: string, values: EmptyCheckValues): string | null {
  const [head, index, field] = path.split('.');
  switch (head) {
    case 'callOpensAt':
      return joinUtcInstant(values.callOpensDate, values.callOpensTime) ? null : 'Enter a date and a time (UTC)';
    case 'callClosesAt':
      return joinUtcInstant(values.callClosesDate, values.callClosesTime) ? null : 'Enter a date and a time (UTC)';
    case 'campaignStart':
    case 'campaignEnd':
      return values[head] ? null : 'Enter a date';
    case 'nodes': {
      const row = values.nodes[Number(index)];
      if (field === 'nodeId' && row?.nodeId === null) return 'Choose a node';
      if (field === 'nodeHoursAvailable' && row?.nodeHoursAvailable === null) return 'Enter the node-hours it offers';
      return null;
    }
    default:
      return null;
  }
}

/** One field of the shared schema (its object part, before the cross-field refinements). */
function fieldSchema(name: 'code' | 'title') {
  return cycleInputSchema.shape[name];
}
