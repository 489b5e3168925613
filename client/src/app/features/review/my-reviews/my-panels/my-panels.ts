import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { ReviewingApi } from '../reviewing-api';

/**
 * The panels the reviewer sits on, above their grading table: each with its cycle, its review
 * deadline and, for the panel's chair once the deadline has passed, the way to the panel's
 * grades, standing and pressure. Shows nothing for a reviewer on no panel (distributed review).
 */
@Component({
  selector: 'app-my-panels',
  imports: [MatButton, MatIcon, RouterLink, UtcInstantPipe],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (panels().length) {
      <section class="my-panels" aria-labelledby="my-panels-title" data-testid="my-panels">
        <h2 id="my-panels-title">Your panels</h2>
        <ul>
          @for (p of panels(); track p.panelId) {
            <li [attr.data-testid]="'my-panel-' + p.panelId">
              <span class="what">
                <strong>{{ p.panelName }}</strong> · {{ p.cycleCode }} · {{ p.proposals }} proposals ·
                {{ p.isChair ? 'you chair it' : 'member' }}
              </span>
              <span class="when">
                @if (p.standingLockedAt) {
                  Standing locked {{ p.standingLockedAt | utcInstant }}
                } @else if (p.panelStage) {
                  Grading closed; the panel discusses the standing
                } @else if (p.reviewDeadline) {
                  Grades due {{ p.reviewDeadline | utcInstant }}
                } @else {
                  No review deadline set yet
                }
              </span>
              @if (p.isChair && p.panelStage) {
                <a mat-stroked-button [routerLink]="['/review/panels', p.panelId]">
                  <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">leaderboard</mat-icon>
                  Grades and standing of {{ p.panelName }}
                </a>
              } @else if (p.isChair) {
                <span class="later">The panel's grades open to you after the deadline.</span>
              }
            </li>
          }
        </ul>
      </section>
    }
  `,
  styles: `
    .my-panels {
      margin: 0 0 16px;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 8px;
    }
    ul {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      gap: 8px;
    }
    li {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 16px;
      padding: 8px 12px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 8px;
    }
    .when,
    .later {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class MyPanels {
  private readonly api = inject(ReviewingApi);
  protected readonly resource = this.api.myPanelsResource();
  /** Nothing while loading or on error: the grading table below carries the page's own states. */
  protected readonly panels = computed(() => (this.resource.hasValue() ? this.resource.value() : []));
}
