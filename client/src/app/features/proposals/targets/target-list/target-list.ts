import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatExpansionPanel, MatExpansionPanelHeader, MatExpansionPanelTitle } from '@angular/material/expansion';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
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
import { MAX_TARGETS_PER_PROPOSAL, TARGET_CSV_COLUMNS, type TargetRow } from '@spincycle/shared/proposals/target-schemas';
import { debounceTime, map } from 'rxjs';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { confirmAction } from '../../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { sortRows, SortValue } from '../../../../ui/table/sort-rows';
import { ProposalStore } from '../../proposal-store';
import { formatDecDms, formatRaHms } from '@spincycle/shared/proposals/sexagesimal';
import { EXAMPLE_TARGET_LIST_URL, TargetApi, TargetUploadResult } from '../target-api';
import { EXPECTED_PERIOD_HINT, TargetDialog, TargetDialogData, TargetDialogResult } from '../target-dialog/target-dialog';
import { TargetUpload } from '../target-upload/target-upload';

const COLUMNS = [
  'name',
  'ra',
  'dec',
  'magnitude',
  'band',
  'colour',
  'colourSystem',
  'ebv',
  'age',
  'ageErr',
  'precision',
  'period',
  'periodErr',
  'notes',
  'actions',
] as const;

function targetValue(row: TargetRow, column: string): SortValue {
  switch (column) {
    case 'name':
      return row.name;
    case 'ra':
      return row.raDeg;
    case 'dec':
      return row.decDeg;
    case 'magnitude':
      return row.magnitude;
    case 'band':
      return row.magnitudeBand;
    case 'colour':
      return row.colour;
    case 'colourSystem':
      return row.colourSystem;
    case 'ebv':
      return row.reddeningEbv;
    case 'age':
      return row.ageMyr;
    case 'ageErr':
      return row.ageUncertaintyMyr;
    case 'precision':
      return row.periodPrecisionDays;
    case 'period':
      return row.periodDays;
    case 'periodErr':
      return row.periodUncertaintyDays;
    case 'notes':
      return row.notes;
    case 'position':
      return row.position;
    default:
      return null;
  }
}

export const FILTER_DEBOUNCE_MS = 200;

/** The targets tab: the list with sort and filter, a form per row, CSV upload and export. */
@Component({
  selector: 'app-target-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DecimalPipe,
    LoadStatus,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatExpansionPanel,
    MatExpansionPanelHeader,
    MatExpansionPanelTitle,
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
    ReactiveFormsModule,
    TargetUpload,
  ],
  templateUrl: './target-list.html',
  styleUrl: './target-list.scss',
})
export default class TargetList {
  private readonly api = inject(TargetApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly store = inject(ProposalStore);

  protected readonly targets = this.api.listResource(() => this.store.id());
  protected readonly columns = computed(() => (this.store.readOnly() ? COLUMNS.filter((c) => c !== 'actions') : [...COLUMNS]));
  protected readonly csvColumns = TARGET_CSV_COLUMNS;
  protected readonly maxTargets = MAX_TARGETS_PER_PROPOSAL;
  protected readonly exampleUrl = EXAMPLE_TARGET_LIST_URL;
  protected readonly exportUrl = computed(() => {
    const id = this.store.id();
    return id === null ? null : this.api.exportUrl(id);
  });
  protected readonly periodHint = EXPECTED_PERIOD_HINT;
  protected readonly ra = formatRaHms;
  protected readonly dec = formatDecDms;

  protected readonly sort = signal<Sort>({ active: '', direction: '' });
  protected readonly filterControl = new FormControl('', { nonNullable: true });
  private readonly filterText = toSignal(
    this.filterControl.valueChanges.pipe(
      debounceTime(FILTER_DEBOUNCE_MS),
      map((text) => text.trim().toLowerCase()),
    ),
    { initialValue: '' },
  );

  /** The rows shown: the server's list, patched with each saved or deleted row. */
  protected readonly rows = linkedSignal<TargetRow[] | undefined, TargetRow[]>({
    source: () => (this.targets.hasValue() ? this.targets.value() : undefined),
    computation: (next, previous) => next ?? previous?.value ?? [],
  });
  protected readonly shown = computed(() => {
    const text = this.filterText();
    const rows = text
      ? this.rows().filter((row) => row.name.toLowerCase().includes(text) || row.notes.toLowerCase().includes(text))
      : this.rows();
    const sort = this.sort();
    return sort.direction ? sortRows(rows, sort, targetValue) : sortRows(rows, { active: 'position', direction: 'asc' }, targetValue);
  });

  protected readonly error = computed(() => loadErrorText(this.targets.error(), 'The targets could not be loaded.'));
  protected readonly empty = computed(() => this.targets.hasValue() && this.rows().length === 0);
  protected readonly announcement = signal('');

  protected openDialog(target?: TargetRow): void {
    const proposalId = this.store.id();
    if (proposalId === null) return;
    this.dialog
      .open<TargetDialog, TargetDialogData, TargetDialogResult>(TargetDialog, {
        data: { proposalId, target },
        width: '640px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .subscribe((result) => {
        if (!result) return;
        if ('reload' in result) {
          this.targets.reload();
          return;
        }
        const saved = result.saved;
        const exists = this.rows().some((row) => row.id === saved.id);
        this.rows.update((rows) => (exists ? rows.map((row) => (row.id === saved.id ? saved : row)) : [...rows, saved]));
        this.announcement.set(`${saved.name} ${exists ? 'saved' : 'added'}.`);
        this.store.refresh();
      });
  }

  protected remove(target: TargetRow): void {
    const proposalId = this.store.id();
    if (proposalId === null) return;
    confirmAction(this.dialog, {
      title: `Delete ${target.name}?`,
      message: `${target.name} and its target plans will be removed from this proposal.`,
      confirmLabel: 'Delete',
      destructive: true,
    }).subscribe((confirmed) => {
      if (!confirmed) return;
      this.api.remove(proposalId, target.id).subscribe({
        next: () => {
          this.rows.update((rows) => rows.filter((row) => row.id !== target.id));
          this.announcement.set(`${target.name} deleted.`);
          this.store.refresh();
        },
        error: (error: unknown) =>
          this.snackBar.open(`${target.name} was not deleted: ${readApiError(error).message}`, 'Dismiss', { duration: 10000 }),
      });
    });
  }

  protected onUploaded(_result: TargetUploadResult): void {
    this.targets.reload();
    this.store.refresh();
  }
}
