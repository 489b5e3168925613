import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { OFFSET_MODE_LABELS, OFFSET_MODES } from '@spincycle/shared/photometry/photometry';
import { controlErrorMessage } from '../../../ui/forms/server-errors';
import { type DetrendForm, OFFSET_MODE_HELP } from './detrend-form';

let nextId = 0;

/**
 * The detrending choices of an analysis, each with one plain line on what it does: zero points
 * (none, per node, per node and night), clipping of outliers at some σ, and binning in time.
 * The form belongs to the owner (createDetrendForm); this draws and explains it.
 */
@Component({
  selector: 'app-detrend-fields',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatError, MatFormField, MatHint, MatInput, MatLabel, MatOption, MatSelect, MatSlideToggle, MatSuffix, ReactiveFormsModule],
  template: `
    <fieldset [formGroup]="form()" class="detrend">
      <legend>How the light curves are prepared</legend>
      <div class="step">
        <mat-form-field class="offsets">
          <mat-label>Zero points</mat-label>
          <mat-select formControlName="offsets" [attr.data-testid]="testId() + '-offsets'">
            @for (mode of modes; track mode) {
              <mat-option [value]="mode">{{ modeLabels[mode] }}</mat-option>
            }
          </mat-select>
          <mat-hint>{{ modeHelp[form().controls.offsets.value] }}</mat-hint>
        </mat-form-field>
      </div>
      <div class="step">
        <mat-slide-toggle formControlName="clip" [attr.data-testid]="testId() + '-clip'" [attr.aria-describedby]="uid + '-clip-help'">
          Leave out outliers
        </mat-slide-toggle>
        @if (form().controls.clip.value) {
          <mat-form-field class="number">
            <mat-label>Beyond</mat-label>
            <input
              matInput
              type="number"
              min="2"
              max="20"
              step="0.5"
              formControlName="clipSigma"
              [attr.data-testid]="testId() + '-clip-sigma'"
            />
            <span matTextSuffix>σ</span>
            @if (form().controls.clipSigma.invalid) {
              <mat-error>{{ errorOf('clipSigma') }}</mat-error>
            }
          </mat-form-field>
        }
        <p class="help" [id]="uid + '-clip-help'">
          Points further from the median than this many σ (measured robustly, from the median absolute deviation) are left out, and the
          check is repeated until none is.
        </p>
      </div>
      <div class="step">
        <mat-slide-toggle formControlName="bin" [attr.data-testid]="testId() + '-bin'" [attr.aria-describedby]="uid + '-bin-help'">
          Average in time bins
        </mat-slide-toggle>
        @if (form().controls.bin.value) {
          <mat-form-field class="number">
            <mat-label>Bin width</mat-label>
            <input
              matInput
              type="number"
              min="1"
              max="1440"
              step="1"
              formControlName="binMinutes"
              [attr.data-testid]="testId() + '-bin-minutes'"
            />
            <span matTextSuffix>min</span>
            @if (form().controls.binMinutes.invalid) {
              <mat-error>{{ errorOf('binMinutes') }}</mat-error>
            }
          </mat-form-field>
        }
        <p class="help" [id]="uid + '-bin-help'">
          The points within each interval are averaged before the periodogram: long light curves of fast cadence are analysed faster, and
          periods of days are not affected by bins of minutes.
        </p>
      </div>
    </fieldset>
  `,
  styles: `
    :host {
      display: block;
    }
    .detrend {
      margin: 0;
      padding: 8px 12px 4px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-medium);
      min-inline-size: 0;
    }
    legend {
      font: var(--mat-sys-title-small);
      padding-inline: 4px;
    }
    .step {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 16px;
      margin-block: 8px;
    }
    .offsets {
      flex: 1 1 320px;
      max-inline-size: 560px;
    }
    .number {
      inline-size: 150px;
    }
    .help {
      flex: 1 1 100%;
      margin: 0;
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      max-inline-size: 80ch;
    }
  `,
})
export class DetrendFields {
  readonly form = input.required<DetrendForm>();
  /** Prefix of the controls' test ids. */
  readonly testId = input('detrend');

  protected readonly uid = `detrend-${++nextId}`;
  protected readonly modes = OFFSET_MODES;
  protected readonly modeLabels = OFFSET_MODE_LABELS;
  protected readonly modeHelp = OFFSET_MODE_HELP;

  protected errorOf(name: 'clipSigma' | 'binMinutes'): string {
    return controlErrorMessage(this.form().controls[name]);
  }
}
