import { COMMA, ENTER } from '@angular/cdk/keycodes';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, FormArray, FormControl, FormGroup, ReactiveFormsModule, ValidationErrors } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatChipGrid, MatChipInput, MatChipInputEvent, MatChipRemove, MatChipRow } from '@angular/material/chips';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatDatepicker, MatDatepickerInput, MatDatepickerToggle } from '@angular/material/datepicker';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import {
  cycleInputSchema,
  DEFAULT_CAPACITY_OVERRUN,
  earliestCampaignStart,
  type CapacityOverrunRule,
  type CycleInput,
} from '@spincycle/shared/cycles/cycle-schemas';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import { map } from 'rxjs';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { confirmAction } from '../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { CycleAdminApi } from '../cycle-admin-api';
import { provideCalendarDates } from '../calendar-date-adapter';
import { fromCalendarDate, joinUtcInstant, splitUtcInstant, toCalendarDate } from '../utc-instant';

/** Hours and minutes, 24-hour clock (what the time fields take). */
const TIME_PATTERN = /^([01]\d|2[0-3]):[0-5]\d(:[0-5]\d)?$/;
const TIME_MESSAGE = 'Enter the time as HH:MM on the 24-hour clock, e.g. 23:59';

/** The time fields: empty or HH:MM (seconds allowed), 24-hour. */
function timeValidator(control: AbstractControl<string>): ValidationErrors | null {
  return !control.value || TIME_PATTERN.test(control.value.trim()) ? null : { schema: TIME_MESSAGE };
}

/** A capacity cut refused by the server (409 `capacity_below_requests`), as the dialog lists it. */
interface CapacityCut {
  nodeCode: string;
  requestedNodeHours: number;
  nodeHoursAvailable: number;
}

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
 * shared schema on this side) to the paths of this form's controls. An instant's error goes to
 * its date input, or to its time input when the date is there and the time is what is wrong.
 * Errors about the node list as a whole come back under `nodes`, shown above the rows.
 */
export function toFormErrorPaths(
  fieldErrors: Record<string, string[]> | undefined,
  values?: Pick<EmptyCheckValues, 'callOpensDate' | 'callOpensTime' | 'callClosesDate' | 'callClosesTime'>,
): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [path, messages] of Object.entries(fieldErrors ?? {})) {
    let key = path.replace(/^cycle\./, '');
    const head = key.split('.')[0];
    if (FIELD_TO_CONTROL[head]) {
      key = FIELD_TO_CONTROL[head];
      const [date, time] =
        head === 'callOpensAt' ? [values?.callOpensDate, values?.callOpensTime] : [values?.callClosesDate, values?.callClosesTime];
      if (values && date && !TIME_PATTERN.test(time ?? '')) key = key.replace(/Date$/, 'Time');
    }
    if (head === 'categories') key = 'categories';
    (out[key] ??= []).push(...messages);
  }
  return out;
}

/**
 * Creates a cycle (/cycles/new) or edits one (/cycles/:id). The call's instants are typed as
 * a UTC date and time, each instant written once in UTC with the person's own time beside it
 * when it reads differently. Saving an edit sends the version read; when someone else saved in
 * between, the form keeps what was typed and offers to reload.
 */
@Component({
  selector: 'app-cycle-form',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    LocalInstantPipe,
    MatButton,
    MatChipGrid,
    MatChipInput,
    MatChipRemove,
    MatChipRow,
    MatDatepicker,
    MatDatepickerInput,
    MatDatepickerToggle,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatIconButton,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatRadioButton,
    MatRadioGroup,
    MatSelect,
    MatSlideToggle,
    ReactiveFormsModule,
    RouterLink,
    UtcInstantPipe,
  ],
  providers: [provideCalendarDates()],
  templateUrl: './cycle-form.html',
  styleUrl: './cycle-form.scss',
})
export default class CycleForm {
  private readonly api = inject(CycleAdminApi);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly dialog = inject(MatDialog);

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

  protected readonly separatorKeys = [ENTER, COMMA] as const;
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    code: new FormControl('', { nonNullable: true, validators: [zodValidator(fieldSchema('code'))] }),
    title: new FormControl('', { nonNullable: true, validators: [zodValidator(fieldSchema('title'))] }),
    /** Calendar dates as the datepicker holds them (local midnight); sent as `YYYY-MM-DD`. */
    callOpensDate: new FormControl<Date | null>(null),
    callOpensTime: new FormControl('00:00', { nonNullable: true, validators: [timeValidator] }),
    callClosesDate: new FormControl<Date | null>(null),
    callClosesTime: new FormControl('23:59', { nonNullable: true, validators: [timeValidator] }),
    campaignStart: new FormControl<Date | null>(null),
    campaignEnd: new FormControl<Date | null>(null),
    anonymousReview: new FormControl(false, { nonNullable: true }),
    capacityOverrun: new FormControl<CapacityOverrunRule>(DEFAULT_CAPACITY_OVERRUN, { nonNullable: true }),
    categories: new FormControl<string[]>([], { nonNullable: true }),
    nodes: new FormArray<NodeRow>([]),
  });

  private readonly value = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue())), {
    initialValue: this.form.getRawValue(),
  });
  protected readonly opensAt = computed(() => joinUtcInstant(toCalendarDate(this.value().callOpensDate), this.value().callOpensTime));
  protected readonly closesAt = computed(() => joinUtcInstant(toCalendarDate(this.value().callClosesDate), this.value().callClosesTime));
  /** The first night the campaign may start on, once the closing instant is known. */
  protected readonly earliestStart = computed(() => {
    const closes = this.closesAt();
    return closes ? fromCalendarDate(earliestCampaignStart(closes)) : null;
  });
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
      const values = this.checkValues();
      for (const issue of parsed.error.issues) {
        const path = issue.path.join('.');
        fieldErrors[path] ??= [emptyFieldMessage(path, values) ?? issue.message];
      }
      this.showErrors(fieldErrors);
      this.form.markAllAsTouched();
      return;
    }
    this.save(parsed.data, false);
  }

  /**
   * Sends the cycle. A cut of some node's capacity below what submitted proposals request comes
   * back as 409 `capacity_below_requests`: the manager confirms it, then it is sent again with
   * `confirmCapacityCut`.
   */
  private save(input: CycleInput, confirmCapacityCut: boolean): void {
    const id = this.cycleId();
    const request =
      id === null
        ? this.api.create(input)
        : this.api.update(id, { version: this.version ?? 1, cycle: input, ...(confirmCapacityCut ? { confirmCapacityCut } : {}) });
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
        if (error instanceof HttpErrorResponse && error.status === 409 && body.code === 'capacity_below_requests') {
          this.confirmCapacityCut(input, (error.error as { nodes?: CapacityCut[] }).nodes ?? [], body.message);
          return;
        }
        if (error instanceof HttpErrorResponse && error.status === 409 && body.code !== 'code_taken' && body.code !== 'node_in_use') {
          this.conflict.set(body.message);
          return;
        }
        const unmatched = this.showErrors(body.fieldErrors);
        this.serverError.set([body.message, ...unmatched].join(' '));
      },
    });
  }

  private confirmCapacityCut(input: CycleInput, cuts: CapacityCut[], fallback: string): void {
    const list = cuts.map(
      (c) =>
        `${c.nodeCode}: submitted proposals request ${formatHours(c.requestedNodeHours)} node-hours; the new capacity is ${formatHours(c.nodeHoursAvailable)}.`,
    );
    confirmAction(this.dialog, {
      title: 'Cut capacity below the requests?',
      message: `${list.length ? list.join(' ') : fallback} The proposals keep their requests, so the pressure on ${cuts.length === 1 ? 'this node' : 'these nodes'} rises above 100 %.`,
      confirmLabel: 'Cut capacity',
      destructive: true,
    }).subscribe((confirmed) => {
      if (confirmed) this.save(input, true);
      else this.serverError.set('Not saved: the capacity was not cut.');
    });
  }

  /** Puts messages under their fields; returns those without a place on the form. */
  private showErrors(fieldErrors: Record<string, string[]> | undefined): string[] {
    const mapped = toFormErrorPaths(fieldErrors, this.checkValues());
    const listMessages = mapped['nodes'];
    delete mapped['nodes'];
    if (listMessages) this.nodesError.set(listMessages.join(' '));
    return applyServerFieldErrors(this.form, mapped);
  }

  /** The form's values with the dates as `YYYY-MM-DD` strings. */
  private checkValues(): EmptyCheckValues {
    const v = this.form.getRawValue();
    return {
      callOpensDate: toCalendarDate(v.callOpensDate),
      callOpensTime: v.callOpensTime.trim(),
      callClosesDate: toCalendarDate(v.callClosesDate),
      callClosesTime: v.callClosesTime.trim(),
      campaignStart: toCalendarDate(v.campaignStart),
      campaignEnd: toCalendarDate(v.campaignEnd),
      nodes: v.nodes,
    };
  }

  /** The form as the API's input; unparsable parts stay as they are so the schema names them. */
  private toInput(): Record<string, unknown> {
    const v = this.form.getRawValue();
    const d = this.checkValues();
    return {
      code: v.code,
      title: v.title,
      callOpensAt: joinUtcInstant(d.callOpensDate, d.callOpensTime) ?? '',
      callClosesAt: joinUtcInstant(d.callClosesDate, d.callClosesTime) ?? '',
      campaignStart: d.campaignStart,
      campaignEnd: d.campaignEnd,
      anonymousReview: v.anonymousReview,
      capacityOverrun: v.capacityOverrun,
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
      callOpensDate: fromCalendarDate(opens.date),
      callOpensTime: opens.time,
      callClosesDate: fromCalendarDate(closes.date),
      callClosesTime: closes.time,
      campaignStart: fromCalendarDate(cycle.campaignStart),
      campaignEnd: fromCalendarDate(cycle.campaignEnd),
      anonymousReview: cycle.anonymousReview,
      capacityOverrun: cycle.capacityOverrun ?? DEFAULT_CAPACITY_OVERRUN,
      categories: [...cycle.categories],
      nodes: cycle.nodes.map((node) => ({ nodeId: node.nodeId, nodeHoursAvailable: node.nodeHoursAvailable })),
    });
    this.form.markAsPristine();
    this.form.markAsUntouched();
  }
}

/** Node-hours in the confirmation: at most two decimals. */
function formatHours(x: number): string {
  return String(Math.round(x * 100) / 100);
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
    case 'callClosesAt': {
      const [date, time] =
        head === 'callOpensAt' ? [values.callOpensDate, values.callOpensTime] : [values.callClosesDate, values.callClosesTime];
      if (joinUtcInstant(date, time)) return null;
      if (!date) return 'Enter a date (YYYY-MM-DD)';
      return TIME_MESSAGE;
    }
    case 'campaignStart':
    case 'campaignEnd':
      return values[head] ? null : 'Enter a date (YYYY-MM-DD)';
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
