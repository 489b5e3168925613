import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { HttpErrorResponse } from '@angular/common/http';
import { RouterLink } from '@angular/router';
import type { ProgramCompletion, ProgramProgress } from '@spincycle/shared/night-plans/night-plans';
import type { ProgramPhotometry } from '@spincycle/shared/photometry/photometry';
import { loadErrorTextUnlessMissing } from '../../../core/http/api-error-message';
import { PhotometryApi } from '../../photometry/photometry-api';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { NightPlansApi } from '../night-plans-api';
import { RECOVERY_EXPLANATION } from '../night-plan-format';
import { completionReason } from '../programs-table/completion-reason';
import { ProgramStateChip } from '../programs-table/program-state-chip';
import { risksOf } from '../programs-table/programs-table';
import { RecoveryBar } from '../programs-table/recovery-bar';

let nextId = 0;

/**
 * The team's view of its program once the facility plans its nights: its state, visits done,
 * planned and required, the chance that the planned visits reveal the targets' periods
 * (explained on demand), and the targets at risk with the reasons. A complete program says why
 * (every visit night its targets need is done, or the campaign ended) and shows what was done
 * instead of what is still at risk, and how far the analysis of the returned light curves has come,
 * with a link to them. Shows nothing while there is no program or no plan (404).
 */
@Component({
  selector: 'app-program-progress-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, MatButton, MatCard, MatIcon, ProgramStateChip, RecoveryBar, RouterLink],
  template: `
    @if (program(); as p) {
      <mat-card appearance="outlined" class="progress-card" data-testid="program-progress-card">
        <section [attr.aria-labelledby]="uid + '-title'">
          <h2 [id]="uid + '-title'">Program progress</h2>
          <p class="state-line" data-testid="program-state">
            <span class="visually-hidden">Program state:</span>
            <app-program-state-chip [state]="p.programState" />
            @if (p.programState === 'complete') {
              <span data-testid="program-completion">{{ completeSentence(p.completion) }} No more visits are planned for it.</span>
            } @else {
              <span class="muted">The facility plans your visits night by night on its nodes.</span>
            }
          </p>
          <p data-testid="program-visits">
            @if (p.programState === 'complete') {
              <strong>{{ p.visitsDone }}</strong> {{ p.visitsDone === 1 ? 'visit was' : 'visits were' }} done; your targets' plans asked for
              {{ p.visitsRequired }}.
            } @else {
              <strong>{{ p.visitsDone }} of {{ p.visitsPlanned }}</strong> planned {{ p.visitsPlanned === 1 ? 'visit' : 'visits' }} done so
              far.
              {{ needed(p) }}
            }
          </p>
          <div class="bar" aria-hidden="true">
            <span class="done" [style.inline-size.%]="share(p.visitsDone, p)"></span>
            <span class="planned" [style.inline-size.%]="share(p.visitsPlanned - p.visitsDone, p)"></span>
          </div>

          <h3>Chance of measuring the periods</h3>
          <p class="recovery">
            <app-recovery-bar [fraction]="p.recoveryFraction" />
            <button
              matButton
              type="button"
              (click)="explain.set(!explain())"
              [attr.aria-expanded]="explain()"
              [attr.aria-controls]="uid + '-why'"
              data-testid="program-recovery-why"
            >
              What does this mean?
            </button>
          </p>
          @if (explain()) {
            <p class="muted explanation" [id]="uid + '-why'" data-testid="program-recovery-explanation">{{ meaning }}</p>
          }

          <h3>Light curves</h3>
          @if (photometry(); as ph) {
            <p class="photometry" data-testid="program-photometry">
              <span>
                @if (ph.progress.targetsWithPhotometry === 0) {
                  No light curve uploaded yet.
                } @else {
                  <strong>{{ ph.progress.targetsAnalysed }} of {{ ph.progress.targetsAwarded }}</strong>
                  {{ ph.progress.targetsAwarded === 1 ? 'target' : 'targets' }} analysed, {{ ph.progress.targetsMeasured }} with a measured
                  period.
                }
              </span>
              <a [routerLink]="['/proposals', proposalId(), 'photometry']" data-testid="program-photometry-link">{{
                ph.canUpload ? 'Upload and read the light curves' : 'Read the light curves'
              }}</a>
            </p>
          } @else if (photometryError()) {
            <p class="muted" data-testid="program-photometry-error">The progress of the light curves could not be loaded.</p>
          } @else if (photometryResource.isLoading()) {
            <p class="muted">Loading the light curves' progress…</p>
          }

          @if (p.programState !== 'complete') {
            <h3>Targets at risk</h3>
            @if (risks(p); as r) {
              @if (r.length) {
                <ul class="risks" data-testid="program-risks">
                  @for (x of r; track x.target) {
                    <li>
                      <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
                      <span
                        ><strong>{{ x.target }}</strong
                        >: {{ x.reasons.join(' ') }}</span
                      >
                    </li>
                  }
                </ul>
              } @else {
                <p class="muted" data-testid="program-risks">None: every target's visits keep their cadence as planned.</p>
              }
            }
          }
        </section>
      </mat-card>
    } @else if (error(); as e) {
      <app-load-status [error]="e" (retry)="resource.reload()" data-testid="program-progress-error" />
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .progress-card {
      margin: 0 0 16px;
    }
    section {
      padding: 12px 16px 16px;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 8px;
    }
    .state-line {
      display: flex;
      flex-wrap: wrap;
      align-items: baseline;
      gap: 8px;
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 16px 0 4px;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .explanation {
      max-inline-size: 80ch;
    }
    .bar {
      display: flex;
      block-size: 10px;
      max-inline-size: 480px;
      border-radius: 5px;
      overflow: hidden;
      background: var(--mat-sys-surface-container-highest);
      outline: 1px solid var(--mat-sys-outline-variant);
    }
    .bar .done {
      background: var(--mat-sys-primary);
    }
    .bar .planned {
      background: color-mix(in srgb, var(--mat-sys-primary) 35%, transparent);
    }
    .recovery {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px;
      margin: 0;
    }
    .photometry {
      display: flex;
      flex-wrap: wrap;
      align-items: baseline;
      gap: 4px 12px;
      margin: 0;
    }
    .risks {
      margin: 0;
      padding: 0;
      list-style: none;
    }
    .risks li {
      display: flex;
      gap: 6px;
      align-items: flex-start;
      margin-block: 4px;
    }
    .risks mat-icon {
      flex: none;
      font-size: 18px;
      inline-size: 18px;
      block-size: 18px;
      color: var(--mat-sys-error);
    }
  `,
})
export class ProgramProgressCard {
  /** The awarded proposal whose program this is. */
  readonly proposalId = input.required<number>();
  private readonly api = inject(NightPlansApi);

  protected readonly uid = `program-progress-${++nextId}`;
  protected readonly resource = this.api.programResource(() => this.proposalId());
  protected readonly program = computed<ProgramProgress | null>(() => (this.resource.hasValue() ? this.resource.value() : null));
  /** No program or no plan yet (404): nothing to show. Any other failure: a small error state. */
  protected readonly error = computed(() =>
    loadErrorTextUnlessMissing(this.resource.error(), 'The progress of your program could not be loaded.'),
  );
  /** The program's returned photometry, asked for once the program is known to exist. */
  private readonly photometryApi = inject(PhotometryApi);
  protected readonly photometryResource = this.photometryApi.programResource(() => (this.program() ? this.proposalId() : null));
  protected readonly photometry = computed<ProgramPhotometry | null>(() =>
    this.photometryResource.hasValue() ? this.photometryResource.value() : null,
  );
  /** A failure other than "no program" (409) or "not found" (404), which show nothing. */
  protected readonly photometryError = computed(() => {
    const error = this.photometryResource.error();
    if (!error) return false;
    const cause = error instanceof HttpErrorResponse ? error : (error as { cause?: unknown }).cause;
    return !(cause instanceof HttpErrorResponse && (cause.status === 404 || cause.status === 409));
  });
  protected readonly explain = signal(false);
  protected readonly meaning = RECOVERY_EXPLANATION;
  protected readonly risks = risksOf;

  private readonly locale = inject(LOCALE_ID);

  /** "Your program is complete: the campaign ended on 15 Apr 2027." */
  protected completeSentence(c: ProgramCompletion | null): string {
    return c ? `Your program is complete: ${completionReason(c, this.locale)}.` : 'Your program is complete.';
  }

  /** "Your targets need 40 visits in all; 6 could not be fitted into the nights awarded." */
  protected needed(p: ProgramProgress): string {
    const all = `Your targets need ${p.visitsRequired} ${p.visitsRequired === 1 ? 'visit' : 'visits'} in all`;
    const short = p.visitsRequired - p.visitsPlanned;
    return short > 0 ? `${all}; ${short} could not be fitted into the nights awarded.` : `${all}, and all of them are planned.`;
  }

  /** Percent of the visits required (the bar's scale). */
  protected share(visits: number, p: ProgramProgress): number {
    const scale = Math.max(p.visitsRequired, p.visitsPlanned);
    return scale > 0 ? (Math.max(0, visits) / scale) * 100 : 0;
  }
}
