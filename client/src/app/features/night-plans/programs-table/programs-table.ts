import { ChangeDetectionStrategy, Component, inject, input, LOCALE_ID, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import type { ProgramCompletion, ProgramProgress, TargetProgress } from '@spincycle/shared/night-plans/night-plans';
import { cadenceAchieved, cadenceAsked, cadenceLate, RECOVERY_EXPLANATION } from '../night-plan-format';
import { completionReason } from './completion-reason';
import { ProgramStateChip } from './program-state-chip';
import { RecoveryBar } from './recovery-bar';

/** The targets of a program at risk, with their reasons. */
export function risksOf(p: ProgramProgress): { target: string; reasons: string[] }[] {
  return p.targets.filter((t) => t.atRisk.length).map((t) => ({ target: `${t.targetName} (${t.nodeCode})`, reasons: t.atRisk }));
}

/**
 * Each program's progress: its state (a complete one says why), visits done, planned and
 * required; the recovery fraction as a bar (what it means on demand); the targets at risk and
 * why. A program opens to its targets, each with its cadence asked and achieved and its own
 * recovery estimate.
 */
@Component({
  selector: 'app-programs-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatIcon, MatIconButton, ProgramStateChip, RecoveryBar],
  templateUrl: './programs-table.html',
  styleUrl: './programs-table.scss',
})
export class ProgramsTable {
  readonly programs = input.required<readonly ProgramProgress[]>();
  readonly colours = input<ReadonlyMap<number, string>>(new Map());

  protected readonly open = signal<ReadonlySet<number>>(new Set());
  /** Target explanations shown, by `proposalId-targetId-nodeId`. */
  protected readonly explained = signal<ReadonlySet<string>>(new Set());
  protected readonly showMeaning = signal(false);
  protected readonly meaning = RECOVERY_EXPLANATION;
  protected readonly risks = risksOf;
  protected readonly asked = cadenceAsked;
  protected readonly achieved = cadenceAchieved;
  protected readonly late = cadenceLate;
  private readonly locale = inject(LOCALE_ID);

  protected reason(c: ProgramCompletion): string {
    return completionReason(c, this.locale);
  }

  protected toggle(id: number): void {
    this.open.update((s) => {
      const next = new Set(s);
      if (!next.delete(id)) next.add(id);
      return next;
    });
  }

  protected key(p: ProgramProgress, t: TargetProgress): string {
    return `${p.proposalId}-${t.targetId}-${t.nodeId}`;
  }

  protected toggleExplanation(key: string): void {
    this.explained.update((s) => {
      const next = new Set(s);
      if (!next.delete(key)) next.add(key);
      return next;
    });
  }
}
