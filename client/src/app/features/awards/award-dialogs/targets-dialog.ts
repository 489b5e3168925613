import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import type { AwardBoardRow } from '@spincycle/shared/awards/awards';
import { DialogShell } from '../../../ui/dialog-shell/dialog-shell';

export interface TargetsDialogData {
  title: string;
  targets: AwardBoardRow['targets'];
  /** Null: every target. */
  selected: number[] | null;
}

/** The chosen targets; null when every target is kept. */
export interface TargetsDialogResult {
  targetIds: number[] | null;
}

/** Lists longer than this get a filter field. */
const FILTER_FROM = 12;

/**
 * Chooses the targets of a partial award: a checkbox per target of the proposal, those with a
 * feasible plan marked, with shortcuts for every target and the feasible ones.
 */
@Component({
  selector: 'app-targets-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, MatButton, MatCheckbox, MatFormField, MatIcon, MatInput, MatLabel],
  template: `
    <app-dialog-shell heading="Targets awarded" confirmLabel="Use these targets" [confirmDisabled]="!chosen().length" (confirmed)="done()">
      <p class="lead">
        “{{ data.title }}”: keep every target, or award only some of them. The node-hours are not changed for you: adjust them in the row to
        the targets you keep.
      </p>
      <div class="shortcuts">
        <button matButton="tonal" type="button" (click)="chooseAll()">All {{ data.targets.length }} targets</button>
        <button matButton="tonal" type="button" (click)="chooseFeasible()" [disabled]="!feasibleCount()">
          Feasible only ({{ feasibleCount() }})
        </button>
        <button matButton type="button" (click)="chosen.set([])">None</button>
      </div>
      @if (data.targets.length > filterFrom) {
        <mat-form-field class="filter" subscriptSizing="dynamic">
          <mat-label>Find a target</mat-label>
          <input matInput type="search" [value]="filter()" (input)="filter.set($any($event.target).value)" autocomplete="off" />
        </mat-form-field>
      }
      <p class="count" aria-live="polite" data-testid="targets-count">{{ chosen().length }} of {{ data.targets.length }} chosen</p>
      <ul class="targets" aria-label="Targets of the proposal">
        @for (t of shown(); track t.id) {
          <li>
            <mat-checkbox [checked]="isChosen(t.id)" (change)="toggle(t.id, $event.checked)" [attr.data-testid]="'target-' + t.id">
              {{ t.name }}
            </mat-checkbox>
            @if (t.feasible) {
              <span class="feasible">
                <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">check_circle</mat-icon>
                feasible
              </span>
            } @else {
              <span class="infeasible">no feasible plan</span>
            }
          </li>
        } @empty {
          <li class="infeasible">No target matches.</li>
        }
      </ul>
      @if (!chosen().length) {
        <p class="problem" role="alert">Choose at least one target, or choose Not awarded for the proposal.</p>
      }
    </app-dialog-shell>
  `,
  styles: `
    .lead,
    .count {
      color: var(--mat-sys-on-surface-variant);
    }
    .shortcuts {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      margin-block: 8px;
    }
    .filter {
      inline-size: 100%;
    }
    .targets {
      list-style: none;
      margin: 0;
      padding: 0;
      max-block-size: 40vh;
      overflow-y: auto;
    }
    .targets li {
      display: flex;
      align-items: center;
      justify-content: space-between;
      gap: 12px;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
    }
    .feasible {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      color: var(--mat-sys-primary);
      font: var(--mat-sys-label-medium);
    }
    .feasible mat-icon {
      font-size: 16px;
      inline-size: 16px;
      block-size: 16px;
    }
    .infeasible {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-label-medium);
    }
    .problem {
      color: var(--mat-sys-error);
    }
  `,
})
export class TargetsDialog {
  protected readonly data = inject<TargetsDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<TargetsDialog, TargetsDialogResult>>(MatDialogRef);
  protected readonly filterFrom = FILTER_FROM;

  protected readonly chosen = signal<number[]>(this.data.selected ?? this.data.targets.map((t) => t.id));
  protected readonly filter = signal('');
  protected readonly feasibleCount = computed(() => this.data.targets.filter((t) => t.feasible).length);
  protected readonly shown = computed(() => {
    const text = this.filter().trim().toLowerCase();
    return text ? this.data.targets.filter((t) => t.name.toLowerCase().includes(text)) : this.data.targets;
  });
  private readonly chosenSet = computed(() => new Set(this.chosen()));

  protected isChosen(id: number): boolean {
    return this.chosenSet().has(id);
  }

  protected toggle(id: number, checked: boolean): void {
    const others = this.chosen().filter((x) => x !== id);
    this.chosen.set(checked ? [...others, id] : others);
  }

  protected chooseAll(): void {
    this.chosen.set(this.data.targets.map((t) => t.id));
  }

  protected chooseFeasible(): void {
    this.chosen.set(this.data.targets.filter((t) => t.feasible).map((t) => t.id));
  }

  protected done(): void {
    const chosen = this.chosenSet();
    if (!chosen.size) return;
    const all = this.data.targets.every((t) => chosen.has(t.id));
    // In the proposal's order, so that the audit log lists them as the team does.
    this.ref.close({ targetIds: all ? null : this.data.targets.filter((t) => chosen.has(t.id)).map((t) => t.id) });
  }
}
