import { ChangeDetectionStrategy, Component, computed, inject, LOCALE_ID, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import type { Proposal } from '@spincycle/shared/proposals/proposal-schemas';
import { Observable } from 'rxjs';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { Clock } from '../../../../core/time/clock';
import { confirmAction } from '../../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { formatLocalInstant, formatUtcInstant } from '../../../../ui/time/date-format';
import { LocalInstantPipe, UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { EDITOR_TABS, tabForField } from '../../editor-tabs';
import { ProposalApi } from '../../proposal-api';
import { ProposalStore } from '../../proposal-store';

const TAB_LABELS: Record<string, string> = Object.fromEntries(EDITOR_TABS.map((tab) => [tab.path, tab.label]));

/**
 * The submit tab: what still stops submission (each problem linked to the tab that fixes it),
 * the cautions, and the PI's Submit and Withdraw, each confirmed with the deadline in UTC (and
 * on the person's own clock when it reads differently).
 */
@Component({
  selector: 'app-proposal-submit',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, LocalInstantPipe, MatButton, MatIcon, MatProgressBar, RouterLink, UtcInstantPipe],
  templateUrl: './proposal-submit.html',
  styleUrl: './proposal-submit.scss',
})
export default class ProposalSubmit {
  private readonly api = inject(ProposalApi);
  private readonly dialog = inject(MatDialog);
  private readonly clock = inject(Clock);
  private readonly locale = inject(LOCALE_ID);
  private readonly router = inject(Router);
  protected readonly store = inject(ProposalStore);

  protected readonly readiness = this.api.readinessResource(() => this.store.id());
  protected readonly check = computed(() => (this.readiness.hasValue() ? this.readiness.value() : null));
  protected readonly problems = computed(() =>
    (this.check()?.problems ?? []).map((p) => ({ ...p, tab: tabForField(p.field), tabLabel: TAB_LABELS[tabForField(p.field)] })),
  );
  private readonly allWarnings = computed(() =>
    (this.check()?.warnings ?? []).map((p) => ({ ...p, tab: tabForField(p.field), tabLabel: TAB_LABELS[tabForField(p.field)] })),
  );
  /** Requests above a node's capacity in the cycle (field `request`), shown in their own caution. */
  protected readonly capacityWarnings = computed(() => this.allWarnings().filter((w) => w.field === 'request'));
  protected readonly warnings = computed(() => this.allWarnings().filter((w) => w.field !== 'request'));
  protected readonly infeasibleTargets = computed(() =>
    (this.store.proposal()?.request ?? []).reduce((sum, r) => sum + r.infeasibleTargets, 0),
  );

  protected readonly proposal = this.store.proposal;
  protected readonly callOpen = computed(() => {
    const proposal = this.proposal();
    return !!proposal && Date.parse(proposal.cycle.callClosesAt) > this.clock.now();
  });
  protected readonly canSubmit = computed(
    () => this.store.isPi() && this.proposal()?.state === 'draft' && this.callOpen() && this.check()?.ready === true,
  );
  protected readonly canWithdraw = computed(() => this.store.isPi() && this.proposal()?.state === 'submitted' && this.callOpen());

  protected readonly busy = signal(false);
  protected readonly actionError = signal<string | null>(null);
  protected readonly announcement = signal('');

  protected readonly readinessError = computed(() => loadErrorText(this.readiness.error(), 'The readiness check could not be loaded.'));

  protected summaryUrl(id: number): string {
    return this.api.summaryPdfUrl(id);
  }

  /**
   * The deadline for the confirmations: `15 Jan 2027, 23:59 UTC`, then the person's own time
   * only when it reads differently (`… (your time: 16 Jan 2027, 00:59 Europe/Berlin)`).
   */
  protected deadline(proposal: Proposal): string {
    const at = proposal.cycle.callClosesAt;
    const local = formatLocalInstant(at, this.locale);
    return local ? `${formatUtcInstant(at, this.locale)} (your time: ${local})` : formatUtcInstant(at, this.locale);
  }

  protected submit(): void {
    const proposal = this.proposal();
    if (!proposal || !this.canSubmit()) return;
    confirmAction(this.dialog, {
      title: 'Submit this proposal?',
      message:
        `“${proposal.title}” goes to the review of cycle ${proposal.cycle.code}. After submission no one on the team can edit it. ` +
        `You can withdraw it to edit again until the call closes on ${this.deadline(proposal)}.`,
      confirmLabel: 'Submit',
    }).subscribe((confirmed) => {
      if (confirmed) this.send(this.api.submit(proposal.id), 'The proposal is submitted.');
    });
  }

  protected withdraw(): void {
    const proposal = this.proposal();
    if (!proposal || !this.canWithdraw()) return;
    confirmAction(this.dialog, {
      title: 'Withdraw this proposal?',
      message: `It returns to draft and will not be reviewed unless it is submitted again before the call closes on ${this.deadline(proposal)}.`,
      confirmLabel: 'Withdraw',
      destructive: true,
    }).subscribe((confirmed) => {
      if (confirmed) this.send(this.api.withdraw(proposal.id), 'The proposal is withdrawn and back to draft.');
    });
  }

  /** The PI discards a draft altogether (DELETE /api/proposals/:id), after confirming. */
  protected deleteDraft(): void {
    const proposal = this.proposal();
    if (!proposal || !this.store.isPi() || proposal.state !== 'draft') return;
    confirmAction(this.dialog, {
      title: 'Delete this draft?',
      message: `“${proposal.title}”, its targets, target plans and justification are deleted for the whole team. This cannot be undone.`,
      confirmLabel: 'Delete draft',
      destructive: true,
    }).subscribe((confirmed) => {
      if (!confirmed) return;
      this.busy.set(true);
      this.api.remove(proposal.id).subscribe({
        next: () => {
          this.busy.set(false);
          void this.router.navigateByUrl('/proposals');
        },
        error: (error: unknown) => {
          this.busy.set(false);
          this.actionError.set(`The draft was not deleted: ${readApiError(error).message}`);
        },
      });
    });
  }

  private send(request: Observable<Proposal>, done: string): void {
    this.busy.set(true);
    this.actionError.set(null);
    request.subscribe({
      next: (updated) => {
        this.busy.set(false);
        this.store.replace(updated);
        this.announcement.set(done);
        this.readiness.reload();
      },
      error: (error: unknown) => {
        this.busy.set(false);
        const body = readApiError(error);
        const details = Object.values(body.fieldErrors ?? {}).flat();
        this.actionError.set([body.message, ...details.filter((d) => !body.message.includes(d))].join(' '));
        this.readiness.reload();
      },
    });
  }
}
