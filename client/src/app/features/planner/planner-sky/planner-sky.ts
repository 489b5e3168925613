import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { SkyWindowChart } from '../../../ui/charts/sky-window-chart/sky-window-chart';
import type { SkyPanel } from '../planner-store';

/**
 * The sky window of the target from each chosen node over the cycle's campaign, with the plan's
 * verdict on each. The plan's own node says its reasons and ways out in the summary; the other
 * nodes say theirs here, each once.
 */
@Component({
  selector: 'app-planner-sky',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatIcon, MatProgressBar, SkyWindowChart],
  templateUrl: './planner-sky.html',
  styleUrl: './planner-sky.scss',
})
export class PlannerSky {
  readonly panels = input<readonly SkyPanel[]>([]);
  readonly loading = input(false);
  /** What is missing before the sky window can be computed, or null. */
  readonly hint = input<string | null>(null);
  /** Why the sky window could not be computed, or null. */
  readonly error = input<string | null>(null);
  readonly retry = output<void>();
}
