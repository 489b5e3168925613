import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatSortHeaderHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import NetworkPage from './network-page';

const NORTH: Site = {
  id: 1,
  code: 'HLM',
  name: 'Hollin Moor',
  latitudeDeg: 28.7606,
  longitudeDeg: -17.8816,
  elevationM: 2326,
  timeZone: 'Atlantic/Canary',
  skyBrightnessMagPerArcsec2: 21.6,
};
const SOUTH: Site = {
  id: 2,
  code: 'SRK',
  name: 'Saltrake Ridge',
  latitudeDeg: -31.2733,
  longitudeDeg: 149.0612,
  elevationM: 1165,
  timeZone: 'Australia/Sydney',
  skyBrightnessMagPerArcsec2: 21.2,
};

function node(id: number, code: string, site: Site, overrides: Partial<TelescopeNode> = {}): TelescopeNode {
  return {
    id,
    code,
    name: `Node ${code}`,
    siteId: site.id,
    site,
    active: true,
    apertureM: 0.4,
    obstructionFraction: 0.35,
    throughput: 0.6,
    band: 'V',
    readNoiseE: 9,
    darkCurrentEPerS: 0.02,
    gainEPerAdu: 1.3,
    saturationE: 60000,
    pixelScaleArcsec: 1.2,
    seeingFwhmArcsec: 1.6,
    systematicFloorMmag: 1.5,
    scintillationModel: 'young1967',
    overheadSeconds: 60,
    minExposureSeconds: 2,
    maxExposureSeconds: 300,
    altitudeLimitDeg: 30,
    sunAltitudeLimitDeg: -12,
    weatherLossFraction: 0.275,
    rateMinorPerHour: 4850,
    currency: 'eur',
    ...overrides,
  };
}

describe('NetworkPage', () => {
  let fixture: ComponentFixture<NetworkPage>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ imports: [NetworkPage], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NetworkPage);
    loader = TestbedHarnessEnvironment.loader(fixture);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  async function answer(nodes: TelescopeNode[], sites: Site[]): Promise<void> {
    backend.expectOne('/api/nodes').flush(nodes);
    backend.expectOne('/api/sites').flush(sites);
    await fixture.whenStable();
  }

  async function nodeRows() {
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=nodes-table]' }));
    return table.getCellTextByColumnName();
  }

  it('formats coordinates with N/S/E/W, numbers with fixed decimals and the rate as money from minor units', async () => {
    await answer(
      [
        node(1, 'N1', NORTH),
        node(2, 'S1', SOUTH, { rateMinorPerHour: 720000, currency: 'jpy', apertureM: 1, weatherLossFraction: 0.4, active: false }),
      ],
      [NORTH, SOUTH],
    );
    const columns = await nodeRows();
    expect(columns['latitude'].text).toEqual(['28.761° N', '31.273° S']);
    expect(columns['longitude'].text).toEqual(['17.882° W', '149.061° E']);
    expect(columns['elevation'].text).toEqual(['2,326', '1,165']);
    expect(columns['aperture'].text).toEqual(['0.40', '1.00']);
    expect(columns['weatherLoss'].text).toEqual(['27.5', '40']);
    expect(columns['rate'].text).toEqual(['€48.50', '¥720,000']);
    expect(columns['active'].text).toEqual(['Active', 'Inactive']);
  });

  it('headers carry the units and numeric cells are right-aligned', async () => {
    await answer([node(1, 'N1', NORTH)], [NORTH]);
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=nodes-table]' }));
    const headers = await (await table.getHeaderRows())[0].getCellTextByIndex();
    expect(headers).toEqual(
      expect.arrayContaining(['Elevation (m)', 'Aperture (m)', 'Altitude limit (°)', 'Weather loss (%)', 'Rate per node-hour']),
    );
    const rateCell = fixture.nativeElement.querySelector('[data-testid=nodes-table] td.mat-column-rate') as HTMLElement;
    expect(rateCell.classList).toContain('num');
  });

  it('fits 1440 px: a "scroll sideways" caption in each table box, names cut to one line with the whole name in a tooltip', async () => {
    await answer([node(1, 'N1', NORTH)], [NORTH]);
    const boxes = Array.from(fixture.nativeElement.querySelectorAll('.table-scroll')) as HTMLElement[];
    expect(boxes).toHaveLength(2);
    for (const box of boxes) {
      expect(box.classList).toContain('table-fit');
      expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
    }
    const name = fixture.nativeElement.querySelector('[data-testid=nodes-table] td.mat-column-name .cell-truncate') as HTMLElement;
    expect(name.classList).toContain('mat-mdc-tooltip-trigger');
  });

  it('sorting by rate orders by the amount, not by its text', async () => {
    await answer(
      [
        node(1, 'A', NORTH, { rateMinorPerHour: 12000 }),
        node(2, 'B', NORTH, { rateMinorPerHour: 900 }),
        node(3, 'C', SOUTH, { rateMinorPerHour: 4500 }),
      ],
      [NORTH, SOUTH],
    );
    const header = await loader.getHarness(MatSortHeaderHarness.with({ label: 'Rate per node-hour' }));
    await header.click();
    expect((await nodeRows())['code'].text).toEqual(['B', 'C', 'A']);
    await header.click();
    expect((await nodeRows())['code'].text).toEqual(['A', 'C', 'B']);
  });

  it('sites table counts the nodes at each site', async () => {
    await answer([node(1, 'N1', NORTH), node(2, 'N2', NORTH), node(3, 'S1', SOUTH)], [NORTH, SOUTH]);
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=sites-table]' }));
    const columns = await table.getCellTextByColumnName();
    expect(columns['code'].text).toEqual(['HLM', 'SRK']);
    expect(columns['nodes'].text).toEqual(['2', '1']);
  });

  it('states where the altitude and Sun limits come from', async () => {
    await answer([node(1, 'N1', NORTH)], [NORTH]);
    expect(fixture.nativeElement.textContent).toContain("The altitude and Sun limits come from each node's own safety configuration.");
  });

  it('no nodes: empty message, no table', async () => {
    await answer([], []);
    expect(fixture.nativeElement.textContent).toContain('No node is defined yet.');
    expect(fixture.nativeElement.querySelector('[data-testid=nodes-table]')).toBeNull();
  });

  it('nodes fail to load: error state with the server message', async () => {
    backend.expectOne('/api/nodes').flush({ code: 'forbidden', message: 'Not allowed.' }, { status: 403, statusText: 'Forbidden' });
    backend.expectOne('/api/sites').flush([NORTH]);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('The nodes could not be loaded. Not allowed.');
    expect(fixture.nativeElement.querySelector('[data-testid=nodes-table]')).toBeNull();
  });
});
