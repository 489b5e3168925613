import { DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, LOCALE_ID, signal, untracked } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, FormControl, FormGroup, ReactiveFormsModule, ValidationErrors } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox, MatCheckboxChange } from '@angular/material/checkbox';
import { MatExpansionPanel, MatExpansionPanelHeader, MatExpansionPanelTitle } from '@angular/material/expansion';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import {
  ABSTRACT_MAX_LENGTH,
  COMPLETENESS_RANGE,
  completenessSchema,
  createProposalSchema,
  updateProposalSchema,
} from '@spincycle/shared/proposals/proposal-schemas';
import type { Proposal } from '@spincycle/shared/proposals/proposal-schemas';
import { AWARD_OUTCOMES } from '@spincycle/shared/awards/awards';
import { map } from 'rxjs';
import { CapacityMeter } from '../../../ui/capacity-meter/capacity-meter';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { formatClockTime } from '../../../ui/time/date-format';
import { DecisionCard } from '../../awards/decision-card/decision-card';
import { BillingContactsCard } from '../../fees/billing-contacts-card/billing-contacts-card';
import { ProgramProgressCard } from '../../night-plans/program-progress-card/program-progress-card';
import { OverviewValues, overviewOf, ProposalStore } from '../proposal-store';

/** One row of the request table: the proposal's request on a node against the cycle's capacity there. */
export interface RequestRow {
  nodeId: number;
  nodeCode: string;
  nodeHours: number;
  infeasibleNodeHours: number;
  infeasibleTargets: number;
  /** Null when the cycle no longer lists the node. */
  nodeHoursAvailable: number | null;
  /** requested ÷ offered; null without capacity. */
  share: number | null;
  overCapacity: boolean;
}

/** The request table's rows, from the proposal's request and its cycle's node capacity. */
export function requestRows(proposal: Proposal): RequestRow[] {
  const offered = new Map(proposal.cycle.nodes.map((n) => [n.nodeId, n.nodeHoursAvailable]));
  return proposal.request.map((r) => {
    const available = offered.get(r.nodeId) ?? null;
    return {
      nodeId: r.nodeId,
      nodeCode: r.nodeCode,
      nodeHours: r.nodeHours,
      infeasibleNodeHours: r.infeasibleNodeHours ?? 0,
      infeasibleTargets: r.infeasibleTargets,
      nodeHoursAvailable: available,
      share: available !== null && available > 0 ? r.nodeHours / available : null,
      overCapacity: available !== null && r.nodeHours > available,
    };
  });
}

/** The form shows the completeness in percent; the API carries the fraction. */
export function completenessToPercent(fraction: number | null): number | null {
  return fraction === null ? null : Number((fraction * 100).toFixed(2));
}

/** Percent typed in the form → the API's fraction (null while the field is empty). */
export function completenessFromPercent(percent: number | null): number | null {
  return percent === null || !Number.isFinite(percent) ? null : Number((percent / 100).toFixed(4));
}

/** The shared completeness schema applied to the percent the form holds (same message as the server). */
function completenessPercentValidator(control: AbstractControl<number | null>): ValidationErrors | null {
  const result = completenessSchema.safeParse(completenessFromPercent(control.value));
  return result.success ? null : { schema: result.error.issues[0]?.message ?? 'Check this value' };
}

/**
 * The overview tab: title, abstract, category, completeness and requested nodes, saved
 * automatically a moment after typing stops. A 409 stops autosave and shows a banner that keeps what was
 * typed until the person chooses to reload.
 */
@Component({
  selector: 'app-proposal-overview',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    BillingContactsCard,
    CapacityMeter,
    DecimalPipe,
    DecisionCard,
    MatButton,
    MatCheckbox,
    MatError,
    MatExpansionPanel,
    MatExpansionPanelHeader,
    MatExpansionPanelTitle,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatSelect,
    MatSuffix,
    PercentPipe,
    ProgramProgressCard,
    ReactiveFormsModule,
  ],
  templateUrl: './proposal-overview.html',
  styleUrl: './proposal-overview.scss',
})
export default class ProposalOverview {
  protected readonly store = inject(ProposalStore);
  private readonly locale = inject(LOCALE_ID);
  protected readonly proposal = this.store.proposal;
  /** `14:05`: when the last save landed, on the person's own clock (they just typed; no day, no zone). */
  protected readonly savedAtText = computed(() => formatClockTime(this.store.savedAt(), this.locale));
  protected readonly abstractMax = ABSTRACT_MAX_LENGTH;
  protected readonly completenessMinPercent = COMPLETENESS_RANGE.min * 100;
  protected readonly completenessMaxPercent = COMPLETENESS_RANGE.max * 100;
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    title: new FormControl('', { nonNullable: true, validators: [zodValidator(createProposalSchema.shape.title)] }),
    abstract: new FormControl('', { nonNullable: true, validators: [zodValidator(updateProposalSchema.shape.abstract)] }),
    category: new FormControl<string | null>(null),
    nodeIds: new FormControl<number[]>([], { nonNullable: true }),
    /** Percent (50–99). */
    completeness: new FormControl<number | null>(null, { validators: [completenessPercentValidator] }),
  });

  protected readonly abstractLength = toSignal(this.form.controls.abstract.valueChanges.pipe(map((v) => v.length)), {
    initialValue: 0,
  });
  protected readonly nodeIds = toSignal(this.form.controls.nodeIds.valueChanges, { initialValue: [] as number[] });
  /** The text that was on screen when the person reloaded after a conflict, offered for copying. */
  protected readonly discarded = signal<OverviewValues | null>(null);

  /**
   * The team's decision card, once the cycle's decisions are released: the release moves the
   * proposal to awarded, reserve or not awarded, so earlier states do not ask for it.
   */
  protected readonly decided = computed(() => {
    const state = this.proposal()?.state;
    return state !== undefined && (AWARD_OUTCOMES as readonly string[]).includes(state);
  });

  protected readonly requestedHours = computed(() => {
    const proposal = this.proposal();
    return proposal ? proposal.request.reduce((sum, r) => sum + r.nodeHours, 0) : 0;
  });

  protected readonly requestRows = computed(() => {
    const proposal = this.proposal();
    return proposal ? requestRows(proposal) : [];
  });
  protected readonly infeasibleHours = computed(() => this.requestRows().reduce((sum, r) => sum + r.infeasibleNodeHours, 0));
  protected readonly overCapacity = computed(() => this.requestRows().filter((r) => r.overCapacity));
  /** One scale for every bar of the table. */
  protected readonly shareScale = computed(() => Math.min(2, Math.max(1, ...this.requestRows().map((r) => r.share ?? 1))));

  private filling = false;
  private filled = false;
  private seenReloads = 0;

  constructor() {
    effect(() => {
      const proposal = this.store.proposal();
      const reloads = this.store.reloads();
      if (proposal) untracked(() => this.sync(proposal, reloads));
    });
    effect(() => {
      const readOnly = this.store.readOnly();
      untracked(() => (readOnly ? this.form.disable({ emitEvent: false }) : this.form.enable({ emitEvent: false })));
    });
    effect(() => {
      const failure = this.store.saveError();
      if (failure?.fieldErrors) untracked(() => applyServerFieldErrors(this.form, failure.fieldErrors));
    });
    this.form.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => {
      if (!this.filling && !this.store.readOnly()) this.store.edit(this.values());
    });
  }

  protected toggleNode(nodeId: number, change: MatCheckboxChange): void {
    const control = this.form.controls.nodeIds;
    const others = control.value.filter((id) => id !== nodeId);
    control.setValue(change.checked ? [...others, nodeId] : others);
  }

  protected reload(): void {
    const draft = this.store.draft();
    this.discarded.set(draft);
    this.store.reload();
  }

  protected retry(): void {
    this.store.flush();
  }

  /**
   * Fills the form from the server's copy: the first time (or what was typed before leaving
   * the tab), after an explicit reload, and when a newer version arrives while nothing typed
   * is waiting to be saved.
   */
  private sync(proposal: Proposal, reloads: number): void {
    if (!this.filled) {
      this.filled = true;
      this.seenReloads = reloads;
      const draft = this.store.draft();
      if (!draft) this.store.rebase(proposal);
      this.fill(draft ?? overviewOf(proposal));
      return;
    }
    if (reloads !== this.seenReloads) {
      this.seenReloads = reloads;
      this.store.rebase(proposal);
      this.fill(overviewOf(proposal));
      return;
    }
    const idle = !this.store.draft() && this.store.saveState() !== 'saving';
    if (idle && proposal.version > (this.store.baseVersion ?? 0)) {
      this.store.rebase(proposal);
      this.fill(overviewOf(proposal));
    }
  }

  private fill(values: OverviewValues): void {
    this.filling = true;
    this.form.setValue({ ...values, nodeIds: [...values.nodeIds], completeness: completenessToPercent(values.completeness) });
    this.filling = false;
  }

  private values(): OverviewValues {
    const v = this.form.getRawValue();
    return {
      title: v.title,
      abstract: v.abstract,
      category: v.category,
      nodeIds: v.nodeIds,
      completeness: completenessFromPercent(v.completeness),
    };
  }
}
