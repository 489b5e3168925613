import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { AuditEntry } from '@spincycle/shared/awards/awards';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { auditActionText, auditValueText, type NodeCodes } from './audit-wording';

/**
 * The award audit log of a cycle, newest first: when, who, which proposal, what was done,
 * the value before and after in plain words, and the reason given.
 */
@Component({
  selector: 'app-award-audit',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIcon, UtcInstantPipe],
  template: `
    <div class="table-scroll" tabindex="0" role="region" aria-label="Audit log of the awards">
      <p class="table-scroll-hint">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
      </p>
      <table data-testid="audit-table">
        <caption class="visually-hidden">
          Every decision, change, release and program event of the cycle, newest first
        </caption>
        <thead>
          <tr>
            <th scope="col">When (UTC)</th>
            <th scope="col">Who</th>
            <th scope="col">Proposal</th>
            <th scope="col">What</th>
            <th scope="col">Before → after</th>
            <th scope="col">Reason</th>
          </tr>
        </thead>
        <tbody>
          @for (e of rows(); track e.id) {
            <tr [attr.data-testid]="'audit-' + e.id">
              <td class="nowrap">
                <time [attr.datetime]="e.at">{{ e.at | utcInstant: false }}</time>
              </td>
              <td>{{ e.who }}</td>
              <td>{{ e.proposal }}</td>
              <td>{{ e.what }}</td>
              <td class="change">
                <span class="before">{{ e.before }}</span>
                <span aria-hidden="true"> → </span><span class="visually-hidden"> changed to </span>
                <span class="after">{{ e.after }}</span>
              </td>
              <td class="reason">{{ e.reason }}</td>
            </tr>
          }
        </tbody>
      </table>
    </div>
  `,
  styles: `
    table {
      border-collapse: collapse;
      inline-size: 100%;
      font-variant-numeric: tabular-nums;
    }
    th,
    td {
      padding: 6px 10px;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
      text-align: start;
      vertical-align: top;
    }
    thead th {
      font-weight: 600;
      white-space: nowrap;
    }
    .nowrap {
      white-space: nowrap;
    }
    .change {
      min-inline-size: 16rem;
    }
    .before {
      color: var(--mat-sys-on-surface-variant);
    }
    .reason {
      min-inline-size: 12rem;
      white-space: pre-line;
    }
  `,
})
export class AwardAudit {
  readonly entries = input.required<readonly AuditEntry[]>();
  /** Node codes by id, to name the nodes of each decision. */
  readonly nodeCodes = input<NodeCodes>(new Map());
  private readonly locale = inject(LOCALE_ID);

  protected readonly rows = computed(() =>
    [...this.entries()]
      .sort((a, b) => Date.parse(b.at) - Date.parse(a.at) || b.id - a.id)
      .map((e) => ({
        id: e.id,
        at: e.at,
        who: e.actorName ?? 'Someone no longer registered',
        proposal: e.proposalTitle ?? (e.entity === 'release' ? 'Every proposal of the cycle' : '—'),
        what: auditActionText(e),
        before: auditValueText(e.before, this.nodeCodes(), this.locale),
        after: auditValueText(e.after, this.nodeCodes(), this.locale),
        reason: e.reason ?? '—',
      })),
  );
}
