import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
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
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { SessionAuth } from '../../../core/auth/session-auth';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { sortRows, SortValue } from '../../../ui/table/sort-rows';
import { CoordinatePipe } from '../../../ui/units/coordinate-pipe';
import { MinorCurrencyPipe } from '../../../ui/units/minor-currency-pipe';
import { NetworkApi } from '../network-api';
import { NodeRateDialog, type NodeRateDialogData, type NodeRateDialogResult } from '../node-rate-dialog/node-rate-dialog';

const NODE_COLUMNS = [
  'code',
  'name',
  'site',
  'latitude',
  'longitude',
  'elevation',
  'aperture',
  'band',
  'altitudeLimit',
  'sunLimit',
  'weatherLoss',
  'rate',
  'externalRate',
  'active',
] as const;

/** Facility managers also get a button per node to set its external rate. */
const MANAGER_NODE_COLUMNS = [...NODE_COLUMNS, 'edit'] as const;

const SITE_COLUMNS = ['code', 'name', 'latitude', 'longitude', 'elevation', 'timeZone', 'sky', 'nodes'] as const;

function nodeValue(node: TelescopeNode, column: string): SortValue {
  switch (column) {
    case 'code':
      return node.code;
    case 'name':
      return node.name;
    case 'site':
      return node.site?.name;
    case 'latitude':
      return node.site?.latitudeDeg;
    case 'longitude':
      return node.site?.longitudeDeg;
    case 'elevation':
      return node.site?.elevationM;
    case 'aperture':
      return node.apertureM;
    case 'band':
      return node.band;
    case 'altitudeLimit':
      return node.altitudeLimitDeg;
    case 'sunLimit':
      return node.sunAltitudeLimitDeg;
    case 'weatherLoss':
      return node.weatherLossFraction;
    case 'rate':
      return node.rateMinorPerHour;
    case 'externalRate':
      // What an external program pays: without an external rate, the academic one.
      return node.externalRateMinorPerHour ?? node.rateMinorPerHour;
    case 'active':
      return node.active;
    default:
      return null;
  }
}

function siteValue(site: Site, column: string): SortValue {
  switch (column) {
    case 'code':
      return site.code;
    case 'name':
      return site.name;
    case 'latitude':
      return site.latitudeDeg;
    case 'longitude':
      return site.longitudeDeg;
    case 'elevation':
      return site.elevationM;
    case 'timeZone':
      return site.timeZone;
    case 'sky':
      return site.skyBrightnessMagPerArcsec2;
    default:
      return null;
  }
}

/**
 * The nodes of the network and the sites they stand at, with each node's academic and external
 * rate. Read-only, except that facility managers set a node's external rate (NodeRateDialog).
 */
@Component({
  selector: 'app-network-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    CoordinatePipe,
    DecimalPipe,
    LoadStatus,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatIconButton,
    MatRow,
    MatRowDef,
    MatSort,
    MatSortHeader,
    MatTable,
    MatTooltip,
    MinorCurrencyPipe,
  ],
  templateUrl: './network-page.html',
  styleUrl: './network-page.scss',
})
export default class NetworkPage {
  private readonly api = inject(NetworkApi);
  private readonly auth = inject(SessionAuth);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly nodes = this.api.nodesResource();
  protected readonly sites = this.api.sitesResource();

  protected readonly canEditRates = computed(() => this.auth.hasRole('facility_manager'));
  protected readonly nodeColumns = computed<readonly string[]>(() => (this.canEditRates() ? MANAGER_NODE_COLUMNS : NODE_COLUMNS));
  protected readonly siteColumns = SITE_COLUMNS;
  protected readonly nodeSort = signal<Sort>({ active: 'code', direction: 'asc' });
  protected readonly siteSort = signal<Sort>({ active: 'code', direction: 'asc' });

  private readonly nodeList = computed(() => (this.nodes.hasValue() ? this.nodes.value() : []));
  private readonly siteList = computed(() => (this.sites.hasValue() ? this.sites.value() : []));

  protected readonly sortedNodes = computed(() => sortRows(this.nodeList(), this.nodeSort(), nodeValue));
  protected readonly sortedSites = computed(() => {
    const counts = new Map<number, number>();
    for (const node of this.nodeList()) counts.set(node.siteId, (counts.get(node.siteId) ?? 0) + 1);
    const rows = this.siteList().map((site) => ({ ...site, nodeCount: counts.get(site.id) ?? 0 }));
    return sortRows(rows, this.siteSort(), (row, column) => (column === 'nodes' ? row.nodeCount : siteValue(row, column)));
  });

  protected readonly nodesError = computed(() => loadErrorText(this.nodes.error(), 'The nodes could not be loaded.'));
  protected readonly sitesError = computed(() => loadErrorText(this.sites.error(), 'The sites could not be loaded.'));
  protected readonly nodesEmpty = computed(() => this.nodes.hasValue() && this.nodeList().length === 0);
  protected readonly sitesEmpty = computed(() => this.sites.hasValue() && this.siteList().length === 0);

  /** Opens the external rate of a node for editing; the table shows the saved node at once. */
  protected editRate(node: TelescopeNode): void {
    this.dialog
      .open<NodeRateDialog, NodeRateDialogData, NodeRateDialogResult>(NodeRateDialog, { data: { node }, autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((saved) => {
        if (!saved) return;
        this.nodes.update((list) => list.map((n) => (n.id === saved.id ? saved : n)));
        this.snackBar.open(`External rate of ${saved.code} saved.`, 'Dismiss', { duration: 6000 });
      });
  }
}
