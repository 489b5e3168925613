import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import CycleList from './cycle-list';

function cycle(id: number, overrides: Partial<CycleSummary> = {}): CycleSummary {
  return {
    id,
    code: `C${id}`,
    title: `Cycle ${id}`,
    callOpensAt: '2026-11-01T12:00:00Z',
    callClosesAt: '2027-01-15T23:59:00Z',
    campaignStart: '2027-03-01',
    campaignEnd: '2027-08-31',
    anonymousReview: false,
    categories: ['Open clusters'],
    version: 1,
    status: 'open',
    nodes: [
      { nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 400 },
      { nodeId: 2, nodeCode: 'VHM-40', nodeHoursAvailable: 250.5 },
    ],
    ...overrides,
  };
}

describe('CycleList', () => {
  let fixture: ComponentFixture<CycleList>;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [CycleList],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CycleList);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  it('one row per cycle: closing time in UTC, status label, nodes with their node-hours, newest call first', async () => {
    backend
      .expectOne('/api/cycles')
      .flush([cycle(1, { status: 'closed', callClosesAt: '2026-01-15T17:00:00Z' }), cycle(2, { title: 'Lantern season' })]);
    await fixture.whenStable();
    const table = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatTableHarness);
    const columns = await table.getCellTextByColumnName();
    expect(columns['title'].text).toEqual(['Lantern season', 'Cycle 1']);
    expect(columns['status'].text).toEqual(['Call open', 'Call closed']);
    // UTC said once, in the column header; each cell holds the instant without the zone.
    expect(await (await table.getHeaderRows())[0].getCellTextByColumnName()).toMatchObject({
      callOpensAt: 'Call opens (UTC)',
      callClosesAt: 'Call closes (UTC)',
    });
    expect(fixture.nativeElement.querySelector('[data-testid=closes-utc]').textContent).toBe('15 Jan 2027, 23:59');
    expect(columns['callClosesAt'].text[0]).not.toContain('UTC');
    // Campaign nights are calendar dates: shown as written, whatever the time zone.
    expect(columns['campaign'].text[0]).toBe('1 Mar 2027 – 31 Aug 2027');
    expect(columns['nodes'].text[0]).toContain('KRG-50');
    expect(columns['nodes'].text[0]).toContain('250.5');
    const [proposals, edit] = Array.from(fixture.nativeElement.querySelectorAll('td.mat-column-actions a')) as HTMLAnchorElement[];
    expect(proposals.getAttribute('href')).toBe('/cycles/2/proposals');
    expect(proposals.textContent).toContain('Proposals');
    expect(edit.getAttribute('href')).toBe('/cycles/2');
  });

  it('no cycles: the empty message', async () => {
    backend.expectOne('/api/cycles').flush([]);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('No cycle is defined yet.');
  });
});
