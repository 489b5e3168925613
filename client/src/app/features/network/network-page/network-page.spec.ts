import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatSortHeaderHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { seedSession, testUser } from '../../../../testing/session';
import { NORTH, SOUTH, testNode } from '../testing/network-fixtures';
import NetworkPage from './network-page';

describe('NetworkPage', () => {
  let fixture: ComponentFixture<NetworkPage>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [NetworkPage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NetworkPage);
    loader = TestbedHarnessEnvironment.loader(fixture);
    TestBed.tick();
  });

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

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
        testNode(1, 'N1', NORTH),
        testNode(2, 'S1', SOUTH, { rateMinorPerHour: 720000, currency: 'jpy', apertureM: 1, weatherLossFraction: 0.4, active: false }),
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
    await answer([testNode(1, 'N1', NORTH)], [NORTH]);
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=nodes-table]' }));
    const headers = await (await table.getHeaderRows())[0].getCellTextByIndex();
    expect(headers).toEqual(
      expect.arrayContaining(['Elevation (m)', 'Aperture (m)', 'Altitude limit (°)', 'Weather loss (%)', 'Academic rate', 'External rate']),
    );
    expect(fixture.nativeElement.querySelector('.page-lead')?.textContent).toContain('Rates are per node-hour');
    for (const column of ['rate', 'externalRate']) {
      const cell = fixture.nativeElement.querySelector(`[data-testid=nodes-table] td.mat-column-${column}`) as HTMLElement;
      expect(cell.classList).toContain('num');
    }
  });

  it('fits 1440 px: a "scroll sideways" caption in each table box, names cut to one line with the whole name in a tooltip', async () => {
    await answer([testNode(1, 'N1', NORTH)], [NORTH]);
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
        testNode(1, 'A', NORTH, { rateMinorPerHour: 12000 }),
        testNode(2, 'B', NORTH, { rateMinorPerHour: 900 }),
        testNode(3, 'C', SOUTH, { rateMinorPerHour: 4500 }),
      ],
      [NORTH, SOUTH],
    );
    const header = await loader.getHarness(MatSortHeaderHarness.with({ label: 'Academic rate' }));
    await header.click();
    expect((await nodeRows())['code'].text).toEqual(['B', 'C', 'A']);
    await header.click();
    expect((await nodeRows())['code'].text).toEqual(['A', 'C', 'B']);
  });

  it('external rate: its amount in the node’s currency, "Same as academic" when it has none, and 0 as an amount', async () => {
    await answer(
      [
        testNode(1, 'N1', NORTH, { externalRateMinorPerHour: 7760 }),
        testNode(2, 'N2', NORTH, { externalRateMinorPerHour: null }),
        testNode(3, 'S1', SOUTH, { rateMinorPerHour: 720000, currency: 'jpy', externalRateMinorPerHour: 900000 }),
        testNode(4, 'S2', SOUTH, { externalRateMinorPerHour: 0 }),
      ],
      [NORTH, SOUTH],
    );
    const columns = await nodeRows();
    expect(columns['rate'].text).toEqual(['€48.50', '€48.50', '¥720,000', '€48.50']);
    expect(columns['externalRate'].text).toEqual(['€77.60', 'Same as academic', '¥900,000', '€0.00']);
  });

  it('sorting by external rate orders by what external programs pay (the academic rate when none is set)', async () => {
    await answer(
      [
        testNode(1, 'A', NORTH, { rateMinorPerHour: 5000, externalRateMinorPerHour: 9000 }),
        testNode(2, 'B', NORTH, { rateMinorPerHour: 7000, externalRateMinorPerHour: null }),
        testNode(3, 'C', NORTH, { rateMinorPerHour: 8000, externalRateMinorPerHour: 6000 }),
      ],
      [NORTH],
    );
    const header = await loader.getHarness(MatSortHeaderHarness.with({ label: 'External rate' }));
    await header.click();
    expect((await nodeRows())['code'].text).toEqual(['C', 'B', 'A']);
  });

  it('people who do not manage the network get no button to change a rate', async () => {
    await seedSession(testUser(['proposer', 'reviewer', 'billing_contact', 'administrator']));
    await answer([testNode(1, 'N1', NORTH)], [NORTH]);
    expect(fixture.nativeElement.querySelector('[data-testid=edit-rate-1]')).toBeNull();
    expect(Object.keys(await nodeRows())).not.toContain('edit');
  });

  it('a facility manager sets a node’s external rate in the dialog and the row shows it at once', async () => {
    await seedSession(testUser(['facility_manager']));
    await answer([testNode(1, 'N1', NORTH), testNode(2, 'N2', NORTH)], [NORTH]);
    const button = fixture.nativeElement.querySelector('[data-testid=edit-rate-2]') as HTMLButtonElement;
    expect(button.getAttribute('aria-label')).toBe('Set the external rate of N2');
    button.click();
    await fixture.whenStable();
    const input = document.querySelector('mat-dialog-container [data-testid=external-rate]') as HTMLInputElement;
    expect(input).not.toBeNull();
    input.value = '61.25';
    input.dispatchEvent(new Event('input'));
    (document.querySelector('mat-dialog-container [data-testid=node-rate-save]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/nodes/2');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ externalRateMinorPerHour: 6125 });
    req.flush(testNode(2, 'N2', NORTH, { externalRateMinorPerHour: 6125 }));
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
    expect((await nodeRows())['externalRate'].text).toEqual(['Same as academic', '€61.25']);
    expect(document.querySelector('mat-dialog-container')).toBeNull();
    expect(document.body.textContent).toContain('External rate of N2 saved.');
  });

  it('sites table counts the nodes at each site', async () => {
    await answer([testNode(1, 'N1', NORTH), testNode(2, 'N2', NORTH), testNode(3, 'S1', SOUTH)], [NORTH, SOUTH]);
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=sites-table]' }));
    const columns = await table.getCellTextByColumnName();
    expect(columns['code'].text).toEqual(['HLM', 'SRK']);
    expect(columns['nodes'].text).toEqual(['2', '1']);
  });

  it('states where the altitude and Sun limits come from', async () => {
    await answer([testNode(1, 'N1', NORTH)], [NORTH]);
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
