import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSelect } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { REVIEW_MODE_LABELS, REVIEW_MODES, type Panel, type ReviewMode } from '@spincycle/shared/review/panels';
import { PROPOSAL_STATE_LABELS } from '@spincycle/shared/proposals/proposal-states';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../../ui/forms/server-errors';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { LocalInstantPipe, UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { joinUtcInstant, splitUtcInstant } from '../../../cycles/utc-instant';
import { ReviewAdminApi } from '../review-admin-api';

/** The panel being created (id null) or edited. */
interface PanelDraft {
  id: number | null;
  version: number;
}

/**
 * /review/manage/:cycleId: the review of one cycle. The settings (mode, reviewers per
 * proposal, deadline); in panel review the panels (name, members, chair) and the table that
 * puts each submitted proposal in a panel; in distributed review the team reviewers with their
 * progress and the button that hands out the proposals.
 */
@Component({
  selector: 'app-cycle-review',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    LocalInstantPipe,
    MatButton,
    MatCheckbox,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    ReactiveFormsModule,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './cycle-review.html',
  styleUrl: './cycle-review.scss',
})
export default class CycleReview {
  private readonly api = inject(ReviewAdminApi);
  /** Route parameter. */
  readonly cycleId = input.required<string>();
  protected readonly id = computed(() => {
    const id = Number(this.cycleId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  protected readonly settings = this.api.settingsResource(this.id);
  protected readonly panels = this.api.panelsResource(this.id);
  protected readonly proposals = this.api.proposalsResource(this.id);
  protected readonly reviewers = this.api.reviewersResource();
  /** Only read in distributed review (the server refuses it in panel review). */
  private readonly teamCycleId = computed(() =>
    this.settings.hasValue() && this.settings.value().reviewMode === 'distributed' ? this.id() : null,
  );
  protected readonly teamReviewers = this.api.teamReviewersResource(this.teamCycleId);

  protected readonly modes = REVIEW_MODES;
  protected readonly modeLabels = REVIEW_MODE_LABELS;
  protected readonly stateLabels = PROPOSAL_STATE_LABELS;
  protected readonly errorOf = controlErrorMessage;

  protected readonly settingsForm = new FormGroup({
    reviewMode: new FormControl<ReviewMode>('panel', { nonNullable: true }),
    reviewersPerProposal: new FormControl(3, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(1), Validators.max(10)],
    }),
    deadlineDate: new FormControl('', { nonNullable: true }),
    deadlineTime: new FormControl('23:59', { nonNullable: true }),
    setAsideLateTeams: new FormControl(false, { nonNullable: true }),
  });
  protected readonly savingSettings = signal(false);
  protected readonly settingsMessage = signal<string | null>(null);
  protected readonly settingsError = signal<string | null>(null);

  protected readonly panelForm = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(80)] }),
    memberIds: new FormControl<number[]>([], { nonNullable: true, validators: [Validators.required] }),
    chairId: new FormControl<number | null>(null, { validators: [Validators.required] }),
  });
  protected readonly editing = signal<PanelDraft | null>(null);
  protected readonly panelError = signal<string | null>(null);
  protected readonly savingPanel = signal(false);
  private readonly chosenMembers = signal<number[]>([]);
  protected readonly chairChoices = computed(() => {
    const chosen = new Set(this.chosenMembers());
    return (this.reviewers.hasValue() ? this.reviewers.value() : []).filter((r) => chosen.has(r.id));
  });

  protected readonly movingProposal = signal<number | null>(null);
  protected readonly proposalError = signal<string | null>(null);
  protected readonly distributing = signal(false);
  protected readonly distributeMessage = signal<string | null>(null);
  protected readonly distributeError = signal<string | null>(null);

  protected readonly mode = computed(() => (this.settings.hasValue() ? this.settings.value().reviewMode : null));
  protected readonly loadError = computed(() => {
    if (this.id() === null) return 'There is no cycle at this address.';
    return loadErrorText(this.settings.error(), 'The review of this cycle could not be loaded.');
  });
  protected readonly panelsError = computed(() => loadErrorText(this.panels.error(), 'The panels could not be loaded.'));
  protected readonly proposalsError = computed(() => loadErrorText(this.proposals.error(), 'The proposals could not be loaded.'));
  protected readonly teamError = computed(() => loadErrorText(this.teamReviewers.error(), 'The team reviewers could not be loaded.'));
  protected readonly panelName = computed(() => new Map((this.panels.hasValue() ? this.panels.value() : []).map((p) => [p.id, p.name])));

  constructor() {
    effect(() => {
      if (!this.settings.hasValue()) return;
      const s = this.settings.value();
      const deadline = s.reviewDeadline ? splitUtcInstant(s.reviewDeadline) : { date: '', time: '23:59' };
      this.settingsForm.reset({
        reviewMode: s.reviewMode,
        reviewersPerProposal: s.reviewersPerProposal,
        deadlineDate: deadline.date,
        deadlineTime: deadline.time,
        setAsideLateTeams: s.setAsideLateTeams,
      });
    });
    this.panelForm.controls.memberIds.valueChanges.pipe(takeUntilDestroyed()).subscribe((ids) => {
      this.chosenMembers.set(ids);
      const chair = this.panelForm.controls.chairId.value;
      if (chair !== null && !ids.includes(chair)) this.panelForm.controls.chairId.setValue(null);
    });
  }

  protected saveSettings(): void {
    const id = this.id();
    if (id === null || this.settingsForm.invalid) return;
    const v = this.settingsForm.getRawValue();
    const reviewDeadline = v.deadlineDate ? joinUtcInstant(v.deadlineDate, v.deadlineTime || '23:59') : null;
    if (v.deadlineDate && !reviewDeadline) {
      this.settingsForm.controls.deadlineDate.setErrors({ server: 'Enter a valid date and time' });
      return;
    }
    this.savingSettings.set(true);
    this.settingsMessage.set(null);
    this.settingsError.set(null);
    this.api
      .saveSettings(id, {
        reviewMode: v.reviewMode,
        reviewersPerProposal: Number(v.reviewersPerProposal),
        reviewDeadline,
        setAsideLateTeams: v.setAsideLateTeams,
      })
      .subscribe({
        next: (saved) => {
          this.savingSettings.set(false);
          this.settings.set(saved);
          this.settingsMessage.set('Review settings saved.');
          this.panels.reload();
        },
        error: (err: unknown) => {
          this.savingSettings.set(false);
          const body = readApiError(err);
          const fieldErrors = { ...body.fieldErrors };
          if (fieldErrors['reviewDeadline']) fieldErrors['deadlineDate'] = fieldErrors['reviewDeadline'];
          delete fieldErrors['reviewDeadline'];
          const rest = applyServerFieldErrors(this.settingsForm, fieldErrors);
          this.settingsError.set(rest.length || !body.fieldErrors ? body.message : null);
        },
      });
  }

  protected newPanel(): void {
    this.panelForm.reset({ name: '', memberIds: [], chairId: null });
    this.panelError.set(null);
    this.editing.set({ id: null, version: 0 });
  }

  protected editPanel(panel: Panel): void {
    this.panelForm.reset({ name: panel.name, memberIds: panel.members.map((m) => m.id), chairId: panel.chairId });
    this.panelError.set(null);
    this.editing.set({ id: panel.id, version: panel.version });
  }

  protected cancelPanel(): void {
    this.editing.set(null);
  }

  protected savePanel(): void {
    const draft = this.editing();
    const cycleId = this.id();
    if (!draft || cycleId === null) return;
    if (this.panelForm.invalid) {
      this.panelForm.markAllAsTouched();
      return;
    }
    const v = this.panelForm.getRawValue();
    const body = { name: v.name.trim(), memberIds: v.memberIds, chairId: v.chairId! };
    this.savingPanel.set(true);
    const request =
      draft.id === null ? this.api.createPanel(cycleId, body) : this.api.updatePanel(draft.id, { ...body, version: draft.version });
    request.subscribe({
      next: () => {
        this.savingPanel.set(false);
        this.editing.set(null);
        this.panels.reload();
      },
      error: (err: unknown) => {
        this.savingPanel.set(false);
        const e = readApiError(err);
        const rest = applyServerFieldErrors(this.panelForm, e.fieldErrors);
        this.panelError.set(rest.length || !e.fieldErrors ? e.message : null);
      },
    });
  }

  protected deletePanel(panel: Panel): void {
    this.panelError.set(null);
    this.api.deletePanel(panel.id, panel.version).subscribe({
      next: () => {
        this.panels.reload();
        this.proposals.reload();
      },
      error: (err: unknown) => this.panelError.set(readApiError(err).message),
    });
  }

  /** Moves one proposal to a panel (or out of every panel, with null). */
  protected movePanel(proposalId: number, panelId: number | null): void {
    const list = this.proposals.hasValue() ? this.proposals.value() : [];
    const proposal = list.find((p) => p.id === proposalId);
    if (!proposal || proposal.panelId === panelId) return;
    const target = panelId ?? proposal.panelId!;
    const members = list.filter((p) => p.panelId === target && p.id !== proposalId).map((p) => p.id);
    const ids = panelId === null ? members : [...members, proposalId];
    this.movingProposal.set(proposalId);
    this.proposalError.set(null);
    this.api.setPanelProposals(target, ids).subscribe({
      next: () => {
        this.movingProposal.set(null);
        this.proposals.reload();
        this.panels.reload();
      },
      error: (err: unknown) => {
        this.movingProposal.set(null);
        this.proposalError.set(readApiError(err).message);
        this.proposals.reload();
      },
    });
  }

  protected distribute(): void {
    const id = this.id();
    if (id === null) return;
    this.distributing.set(true);
    this.distributeMessage.set(null);
    this.distributeError.set(null);
    this.api.distribute(id).subscribe({
      next: (result) => {
        this.distributing.set(false);
        this.distributeMessage.set(
          `${result.reviewers} ${result.reviewers === 1 ? 'reviewer was' : 'reviewers were'} given proposals: ${result.added} new, ${result.removed} withdrawn.`,
        );
        this.teamReviewers.set(result.rows);
      },
      error: (err: unknown) => {
        this.distributing.set(false);
        this.distributeError.set(readApiError(err).message);
      },
    });
  }

  protected memberNames(panel: Panel): string {
    return panel.members.map((m) => (m.id === panel.chairId ? `${m.displayName} (chair)` : m.displayName)).join(', ');
  }
}
