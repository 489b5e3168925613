import { PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, effect, ElementRef, inject, signal, viewChildren } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSort, MatSortHeader, Sort } from '@angular/material/sort';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import { MatTooltip } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import type { MyReviewCycle, MyReviewRow, ReviewTeam } from '@spincycle/shared/review/reviewing';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { confirmAction } from '../../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { sortRows, SortValue } from '../../../../ui/table/sort-rows';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { ConflictDialog, ConflictDialogData } from '../conflict-dialog/conflict-dialog';
import { ExpertiseCard } from '../expertise/expertise-card';
import { MyPanels } from '../my-panels/my-panels';
import { parseGrade, ReviewSaver } from '../review-saver';
import { ReviewingApi } from '../reviewing-api';

const COLUMNS = ['title', 'category', 'cycle', 'assessment', 'grade', 'actions'] as const;

function rowValue(r: MyReviewRow, column: string): SortValue {
  switch (column) {
    case 'title':
      return r.title;
    case 'category':
      return r.category;
    case 'cycle':
      return r.cycleCode;
    case 'assessment':
      return r.assessment.feasibleShare;
    case 'grade':
      return r.grade;
    default:
      return null;
  }
}

/**
 * The reviewer's grading table (/review/my): every assigned proposal with its technical
 * assessment in one line and an inline grade that saves on its own. Keyboard first: Enter or
 * Tab in a grade moves to the next row's grade. Per cycle, "Submit all" sends every grade at
 * once after a confirmation; from then on (or once the deadline passed) the rows are read-only.
 */
@Component({
  selector: 'app-review-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ExpertiseCard,
    LoadStatus,
    MyPanels,
    MatButton,
    MatCell,
    MatCellDef,
    MatCheckbox,
    MatColumnDef,
    MatFormField,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatIconButton,
    MatInput,
    MatLabel,
    MatPrefix,
    MatRow,
    MatRowDef,
    MatSort,
    MatSortHeader,
    MatTable,
    MatTooltip,
    PercentPipe,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './review-table.html',
  styleUrl: './review-table.scss',
})
export default class ReviewTable {
  private readonly api = inject(ReviewingApi);
  private readonly dialog = inject(MatDialog);
  protected readonly data = this.api.myReviewsResource();
  protected readonly columns = COLUMNS;
  protected readonly sort = signal<Sort>({ active: '', direction: '' });
  protected readonly filterText = signal('');
  protected readonly onlyUngraded = signal(false);
  /** A sentence about the last "Submit all" or conflict (success or refusal). */
  protected readonly notice = signal<{ text: string; error: boolean } | null>(null);
  protected readonly submitting = signal<number | null>(null);
  private readonly gradeInputs = viewChildren<ElementRef<HTMLInputElement>>('gradeInput');

  /** One saver per proposal, kept across reloads so that a failed save keeps retrying. */
  private readonly savers = new Map<number, ReviewSaver>();
  /** Rows as last saved (the table reflects saves without reloading the list). */
  private readonly savedRows = signal(new Map<number, MyReviewRow>());

  protected readonly cycles = computed<MyReviewCycle[]>(() => (this.data.hasValue() ? this.data.value().cycles : []));
  protected readonly allRows = computed<MyReviewRow[]>(() => {
    const saved = this.savedRows();
    return (this.data.hasValue() ? this.data.value().reviews : []).map((r) => saved.get(r.proposalId) ?? r);
  });
  protected readonly rows = computed(() => {
    const q = this.filterText().trim().toLowerCase();
    const filtered = this.allRows().filter(
      (r) =>
        (!q || `${r.title} ${r.category ?? ''} ${r.cycleCode}`.toLowerCase().includes(q)) && (!this.onlyUngraded() || r.grade === null),
    );
    return sortRows(filtered, this.sort(), rowValue);
  });
  protected readonly error = computed(() => loadErrorText(this.data.error(), 'Your assigned proposals could not be loaded.'));
  protected readonly empty = computed(() => this.data.hasValue() && this.data.value().reviews.length === 0);

  constructor() {
    inject(DestroyRef).onDestroy(() => this.savers.forEach((s) => s.destroy()));
    // A reload (after a conflict or a submission) brings fresh rows: locked ones stop their savers.
    effect(() => {
      if (!this.data.hasValue()) return;
      for (const r of this.data.value().reviews) {
        if (r.locked) this.savers.get(r.proposalId)?.status.set('locked');
      }
    });
  }

  /** The saver of a row (made on first use). */
  protected saver(row: MyReviewRow): ReviewSaver {
    let s = this.savers.get(row.proposalId);
    if (!s) {
      s = new ReviewSaver(
        row,
        (input) => this.api.save(row.proposalId, input),
        (saved) => this.savedRows.update((m) => new Map(m).set(saved.proposalId, saved)),
      );
      this.savers.set(row.proposalId, s);
    }
    return s;
  }

  /**
   * Rows keep their elements across saves (a saved row is a new object): without this the
   * table would rebuild a row under the person typing, taking the focus and the typed text.
   */
  protected readonly trackRow = (_index: number, row: MyReviewRow): number => row.proposalId;

  /** Grades as the list was loaded, by proposal: the input shows them and is then left to the person typing. */
  private readonly loadedGrades = computed(
    () => new Map((this.data.hasValue() ? this.data.value().reviews : []).map((r) => [r.proposalId, r.grade] as const)),
  );

  /**
   * The text of a row's grade field. Saves do not rewrite it under the person's fingers; only a
   * change made elsewhere (a version conflict) puts the stored grade back in.
   */
  protected gradeText(row: MyReviewRow): string {
    const s = this.savers.get(row.proposalId);
    const grade = s && s.status() === 'conflict' ? s.row().grade : (this.loadedGrades().get(row.proposalId) ?? null);
    return grade === null ? '' : grade.toFixed(1);
  }

  /** "PI name, affiliation; affiliation" (shown only outside anonymous cycles). */
  protected teamText(team: ReviewTeam): string {
    return team.affiliations.length ? `${team.piName}, ${team.affiliations.join('; ')}` : team.piName;
  }

  protected onGradeInput(row: MyReviewRow, text: string): void {
    const parsed = parseGrade(text);
    const s = this.saver(row);
    if ('error' in parsed) s.invalid(parsed.error);
    else s.edit({ grade: parsed.grade });
  }

  protected onGradeKeydown(event: KeyboardEvent, index: number): void {
    const forward = event.key === 'Enter' || (event.key === 'Tab' && !event.shiftKey);
    if (!forward) return;
    const inputs = this.gradeInputs();
    const next = inputs[index + 1];
    const row = this.rows()[index];
    if (row) this.saver(row).flush();
    if (next) {
      event.preventDefault();
      next.nativeElement.focus();
      next.nativeElement.select();
    } else if (event.key === 'Enter') {
      event.preventDefault();
    }
  }

  protected statusText(row: MyReviewRow): string {
    if (row.locked) return row.lockedBecause === 'submitted' ? 'Submitted' : 'Deadline passed';
    switch (this.saver(row).status()) {
      case 'pending':
        return 'Not saved yet';
      case 'saving':
        return 'Saving…';
      case 'saved':
        return 'Saved';
      case 'failed':
        return 'Save failed';
      case 'invalid':
        return 'Check the grade';
      case 'conflict':
        return 'Changed elsewhere';
      case 'locked':
        return 'Locked';
      default:
        return row.savedAt ? 'Saved' : '';
    }
  }

  protected declareConflict(row: MyReviewRow): void {
    this.dialog
      .open<ConflictDialog, ConflictDialogData, boolean>(ConflictDialog, {
        data: { proposalId: row.proposalId, title: row.title },
        width: '480px',
      })
      .afterClosed()
      .subscribe((declared) => {
        if (!declared) return;
        this.savers.get(row.proposalId)?.destroy();
        this.savers.delete(row.proposalId);
        this.notice.set({
          text: `Conflict declared: “${row.title}” has left your list and the facility managers were told.`,
          error: false,
        });
        this.data.reload();
      });
  }

  protected submitAll(cycle: MyReviewCycle): void {
    const ungraded = this.allRows().filter((r) => r.cycleId === cycle.id && r.grade === null).length;
    confirmAction(this.dialog, {
      title: `Submit all reviews for ${cycle.code}?`,
      message:
        ungraded > 0
          ? `${ungraded} of your ${cycle.assigned} proposals in ${cycle.code} have no grade yet; submitting will be refused until every one has a grade.`
          : `All ${cycle.assigned} grades and comments for ${cycle.code} are sent to the committee. After that you can no longer change them.`,
      confirmLabel: 'Submit all',
    }).subscribe((ok) => {
      if (!ok) return;
      this.submitting.set(cycle.id);
      this.api.submit(cycle.id).subscribe({
        next: (result) => {
          this.submitting.set(null);
          this.notice.set({ text: `${result.submitted} reviews for ${cycle.code} submitted.`, error: false });
          this.data.reload();
        },
        error: (err: unknown) => {
          this.submitting.set(null);
          this.notice.set({ text: readApiError(err).message, error: true });
        },
      });
    });
  }

  protected canSubmit(cycle: MyReviewCycle): boolean {
    const rows = this.allRows().filter((r) => r.cycleId === cycle.id);
    return rows.some((r) => !r.locked);
  }
}
