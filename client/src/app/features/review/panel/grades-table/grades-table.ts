import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { MatTooltip } from '@angular/material/tooltip';
import type { PanelStatisticsReport, StatisticsRow } from '@spincycle/shared/review/standing';

/**
 * The panel's grades: one row per proposal (best normalised mean first), its mean, median,
 * normalised mean, spread and notes, then each reviewer's grade and its normalised value side
 * by side. The figures come first so that they show without scrolling however many reviewers
 * the panel has; the proposal column stays in place while the reviewers' columns scroll.
 * Rows whose grades spread more than the threshold are flagged; rows not discussed are greyed.
 */
@Component({
  selector: 'app-grades-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, MatIcon, MatTooltip],
  template: `
    <div class="table-scroll" tabindex="0" role="region" aria-label="Grades of the panel">
      <p class="table-scroll-hint">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
      </p>
      <table class="grades" data-testid="grades-table">
        <caption class="visually-hidden">
          Grades of each proposal: the proposal's figures, then each reviewer's grade and its normalised value
        </caption>
        <thead>
          <tr>
            <th scope="col" rowspan="2" class="title">Proposal</th>
            <th scope="col" rowspan="2" class="num">Mean grade</th>
            <th scope="col" rowspan="2" class="num">Median grade</th>
            <th scope="col" rowspan="2" class="num">Normalised mean</th>
            <th scope="col" rowspan="2" class="num">Spread (grade points)</th>
            <th scope="col" rowspan="2" class="notes">Notes</th>
            @for (r of report().reviewers; track r.id) {
              <th scope="colgroup" colspan="2" class="reviewer">{{ r.displayName }}</th>
            }
          </tr>
          <tr>
            @for (r of report().reviewers; track r.id) {
              <th scope="col" class="num sub">Grade</th>
              <th scope="col" class="num sub">Normalised</th>
            }
          </tr>
        </thead>
        <tbody>
          @for (row of report().proposals; track row.proposalId) {
            <tr [class.not-discussed]="row.notDiscussed" [class.flagged]="row.flagged" [attr.data-testid]="'grades-row-' + row.proposalId">
              <th scope="row" class="title">
                <span>{{ row.title }}</span>
                @if (row.team; as team) {
                  <span class="team">{{ team.piName }}{{ team.piAffiliation ? ', ' + team.piAffiliation : '' }}</span>
                }
              </th>
              <td class="num">{{ row.mean === null ? '—' : (row.mean | number: '1.2-2') }}</td>
              <td class="num">{{ row.median === null ? '—' : (row.median | number: '1.1-2') }}</td>
              <td class="num strong">{{ row.normalisedMean === null ? '—' : (row.normalisedMean | number: '1.2-2') }}</td>
              <td class="num">{{ row.spread === null ? '—' : (row.spread | number: '1.1-1') }}</td>
              <td class="notes">
                @if (row.flagged) {
                  <span class="flag" [matTooltip]="'The grades differ by more than ' + threshold() + ' points'">
                    <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">forum</mat-icon>
                    Discuss: grades differ
                  </span>
                }
                @if (row.notDiscussed) {
                  <span class="not-discussed-label">Not discussed</span>
                }
                @if (row.gradeCount === 0) {
                  <span class="muted">No grades yet</span>
                }
              </td>
              @for (r of report().reviewers; track r.id) {
                @if (gradeOf(row, r.id); as g) {
                  <td class="num">{{ g.raw | number: '1.1-1' }}</td>
                  <td class="num normalised">{{ g.normalised | number: '1.2-2' }}</td>
                } @else {
                  <td class="num none" aria-label="no grade">—</td>
                  <td class="num none" aria-label="no grade">—</td>
                }
              }
            </tr>
          }
        </tbody>
      </table>
    </div>
    <p class="explain" data-testid="normalisation-explained">
      How grades are normalised: each reviewer's grades are compared with that reviewer's own average in this panel. A grade's normalised
      value is how far it lies above (+) or below (−) the reviewer's average, in units of the spread of that reviewer's grades (the standard
      deviation over all of their grades here). A reviewer who gave only one grade, or the same grade every time, gets 0 for each, so their
      grades neither raise nor lower a proposal. The normalised mean is the average of a proposal's normalised values; the spread is the
      highest grade minus the lowest. This is a common way to even out generous and strict graders.
    </p>
  `,
  styles: `
    table {
      border-collapse: collapse;
      font-variant-numeric: tabular-nums;
      font: var(--mat-sys-body-medium);
      min-inline-size: 100%;
    }
    th,
    td {
      padding: 6px 10px;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
      text-align: start;
      vertical-align: top;
    }
    .num {
      text-align: end;
      white-space: nowrap;
    }
    /* A figure's header may wrap onto two lines, so that the columns stay as narrow as their numbers. */
    thead .num {
      white-space: normal;
      text-wrap: balance;
      min-inline-size: 4.5em;
    }
    /* The proposal keeps a readable width, and its place, when the table scrolls sideways. */
    .title {
      min-inline-size: 14em;
      position: sticky;
      inset-inline-start: 0;
      z-index: 1;
      background: var(--table-scroll-surface, var(--mat-sys-surface));
      box-shadow: inset -1px 0 0 var(--mat-sys-outline-variant);
    }
    @media (max-width: 599.98px) {
      .title {
        min-inline-size: 9em;
      }
    }
    .notes {
      min-inline-size: 10em;
    }
    .sub {
      font: var(--mat-sys-label-small);
    }
    /* The box's own border closes the table. */
    tbody tr:last-child > * {
      border-block-end: 0;
    }
    .reviewer {
      text-align: center;
    }
    .title span {
      display: block;
    }
    .team {
      font: var(--mat-sys-body-small);
    }
    .team,
    .muted,
    .normalised {
      color: var(--mat-sys-on-surface-variant);
    }
    .strong {
      font-weight: 600;
    }
    /* Greyed by colour, not by opacity: the sticky proposal cell must stay opaque. */
    tr.not-discussed,
    tr.not-discussed .title {
      color: var(--mat-sys-on-surface-variant);
      background: var(--mat-sys-surface-container);
    }
    .flag {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      color: var(--mat-sys-tertiary);
      font-weight: 600;
      white-space: nowrap;
    }
    .notes span {
      display: block;
    }
    .explain {
      max-inline-size: 72ch;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class GradesTable {
  readonly report = input.required<PanelStatisticsReport>();
  protected readonly threshold = computed(() => this.report().panel.spreadThreshold);

  protected gradeOf(row: StatisticsRow, reviewerId: number) {
    return row.grades.find((g) => g.reviewerId === reviewerId) ?? null;
  }
}
