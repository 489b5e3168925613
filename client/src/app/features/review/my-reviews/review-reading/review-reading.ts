import { DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, effect, inject, input, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { DomSanitizer, SafeResourceUrl } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import { COMMITTEE_NOTE_MAX, STRENGTHS_MAX, WEAKNESSES_MAX, type ReviewProposal } from '@spincycle/shared/review/reviewing';
import { RISK_LABELS, type TargetRisk } from '@spincycle/shared/review/technical-assessment';
import { loadErrorText } from '../../../../core/http/api-error-message';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { ClusterChart, type ClusterPointSelection } from '../../../proposals/plans/cluster-chart/cluster-chart';
import { SkyWindowDialog, type SkyWindowDialogData } from '../../../proposals/targets/sky-window-dialog/sky-window-dialog';
import type { PlanMarker } from '@spincycle/shared/proposals/plan-types';
import { ConflictDialog, ConflictDialogData } from '../conflict-dialog/conflict-dialog';
import { parseGrade, ReviewSaver, type ReviewDraft } from '../review-saver';
import { ReviewingApi } from '../reviewing-api';

/**
 * Reading one assigned proposal (/review/my/:proposalId): abstract, the justification PDF in a
 * frame, the targets with their plans on the requested nodes, the technical assessment with an
 * explanation beside each number, and the review itself (grade, strengths, weaknesses, note to
 * the committee) saving on its own as the reviewer writes.
 */
@Component({
  selector: 'app-review-reading',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ClusterChart,
    DecimalPipe,
    LoadStatus,
    MatButton,
    MatIconButton,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    PercentPipe,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './review-reading.html',
  styleUrl: './review-reading.scss',
})
export default class ReviewReading {
  /** Route parameter. */
  readonly proposalId = input.required<string>();
  private readonly id = computed(() => {
    const id = Number(this.proposalId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });
  private readonly api = inject(ReviewingApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly sanitizer = inject(DomSanitizer);
  protected readonly proposal = this.api.proposalResource(this.id);
  protected readonly data = computed<ReviewProposal | null>(() => (this.proposal.hasValue() ? this.proposal.value() : null));
  /** Plan markers of the period–colour chart (feasibility and period per target and node). */
  protected readonly markers = computed<PlanMarker[]>(() =>
    (this.data()?.targets ?? []).flatMap((t) =>
      t.plans.map((p) => ({ targetId: t.id, nodeId: p.nodeId, feasible: p.feasible, periodDays: p.periodDays })),
    ),
  );

  /** Opens a target's sky window from the nodes it was planned on (the requested nodes when none). */
  protected openSkyWindow(targetId: number, nodeId?: number): void {
    const d = this.data();
    const t = d?.targets.find((x) => x.id === targetId);
    if (!d || !t) return;
    const planned = t.plans.map((p) => ({ nodeId: p.nodeId, nodeCode: p.nodeCode }));
    const nodes = planned.length ? planned : d.nodes.map((n) => ({ nodeId: n.id, nodeCode: n.code }));
    if (!nodes.length) return;
    const data: SkyWindowDialogData = {
      proposalId: d.review.proposalId,
      targetId,
      targetName: t.name,
      nodes,
      nodeId: nodeId ?? nodes[0].nodeId,
      verdicts: Object.fromEntries(t.plans.map((p) => [p.nodeId, p.skyVerdict])),
      reviewing: true,
    };
    this.dialog.open(SkyWindowDialog, { data, width: '880px', maxWidth: '95vw' });
  }

  protected onPointSelected(selection: ClusterPointSelection): void {
    this.openSkyWindow(selection.targetId, selection.nodeIds[0]);
  }

  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no proposal at this address.';
    return loadErrorText(this.proposal.error(), 'This proposal could not be loaded.');
  });
  protected readonly saver = signal<ReviewSaver | null>(null);
  protected readonly gradeError = signal<string | null>(null);
  protected readonly limits = { strengths: STRENGTHS_MAX, weaknesses: WEAKNESSES_MAX, committeeNote: COMMITTEE_NOTE_MAX };
  protected readonly riskLabels = RISK_LABELS;

  /** The PDF's address, trusted for the frame: it is our own API's same-origin URL, never user input. */
  protected readonly pdfUrl = computed<SafeResourceUrl | null>(() => {
    const url = this.data()?.justificationUrl;
    return url ? this.sanitizer.bypassSecurityTrustResourceUrl(url) : null;
  });

  constructor() {
    effect(() => {
      const d = this.data();
      if (!d) return;
      const current = this.saver();
      if (current && current.row().proposalId === d.review.proposalId) return;
      current?.destroy();
      this.saver.set(new ReviewSaver(d.review, (input) => this.api.save(d.review.proposalId, input)));
    });
    // A change made in another window: show the stored review (the saver already holds it).
    effect(() => {
      if (this.saver()?.status() === 'conflict') this.proposal.reload();
    });
    inject(DestroyRef).onDestroy(() => this.saver()?.destroy());
  }

  protected draft(): ReviewDraft | null {
    return this.saver()?.current() ?? null;
  }

  protected gradeText(): string {
    const g = this.data()?.review.grade ?? null;
    return g === null ? '' : g.toFixed(1);
  }

  protected onGrade(text: string): void {
    const parsed = parseGrade(text);
    if ('error' in parsed) {
      this.gradeError.set(parsed.error);
      this.saver()?.invalid(parsed.error);
    } else {
      this.gradeError.set(null);
      this.saver()?.edit({ grade: parsed.grade });
    }
  }

  protected onText(field: 'strengths' | 'weaknesses' | 'committeeNote', value: string): void {
    this.saver()?.edit({ [field]: value });
  }

  protected statusText(): string {
    const s = this.saver();
    if (!s) return '';
    const row = s.row();
    if (row.locked)
      return row.lockedBecause === 'submitted'
        ? 'Submitted: your review can no longer change.'
        : 'The review deadline has passed: your review can no longer change.';
    switch (s.status()) {
      case 'pending':
        return 'Not saved yet';
      case 'saving':
        return 'Saving…';
      case 'saved':
        return 'Saved';
      case 'failed':
        return 'Save failed';
      case 'invalid':
        return 'Not saved: check the grade';
      case 'conflict':
        return 'Changed elsewhere';
      case 'locked':
        return 'Locked';
      default:
        return row.savedAt ? 'Saved' : 'Not graded yet';
    }
  }

  /** "Sky window shorter than the plan needs on N1, N2: observable on 20 nights, …". */
  protected riskText(r: TargetRisk): string {
    const where = r.nodeCodes.length ? ` on ${r.nodeCodes.join(', ')}` : '';
    return `${this.riskLabels[r.kind]}${where}: ${r.detail}`;
  }

  protected declareConflict(d: ReviewProposal): void {
    this.dialog
      .open<ConflictDialog, ConflictDialogData, boolean>(ConflictDialog, {
        data: { proposalId: d.review.proposalId, title: d.review.title },
        width: '480px',
      })
      .afterClosed()
      .subscribe((declared) => {
        if (declared) void this.router.navigate(['/review/my']);
      });
  }
}
