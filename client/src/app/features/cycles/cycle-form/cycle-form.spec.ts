import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { provideRouter, Router } from '@angular/router';
import type { CycleSummary, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import CycleForm, { toFormErrorPaths } from './cycle-form';

const CYCLE: CycleSummary = {
  id: 7,
  code: '2027A',
  title: 'Lantern season',
  callOpensAt: '2026-11-01T12:00:00Z',
  callClosesAt: '2027-01-15T23:59:00Z',
  campaignStart: '2027-03-01',
  campaignEnd: '2027-08-31',
  anonymousReview: true,
  categories: ['Open clusters', 'Field stars'],
  version: 3,
  status: 'upcoming',
  nodes: [{ nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 400 }],
};

const NODES = [{ id: 1, code: 'KRG-50', name: 'Korrig fifty' }, { id: 2, code: 'VHM-40', name: 'Vellham forty' }] as TelescopeNode[];

describe('CycleForm', () => {
  let fixture: ComponentFixture<CycleForm>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let navigateByUrl: jest.SpyInstance;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [CycleForm],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: jest.fn() } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    navigateByUrl = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    fixture = TestBed.createComponent(CycleForm);
    loader = TestbedHarnessEnvironment.loader(fixture);
  });

  afterEach(() => backend.verify());

  async function openExisting(cycle: CycleSummary = CYCLE): Promise<void> {
    fixture.componentRef.setInput('id', String(cycle.id));
    TestBed.tick();
    backend.expectOne('/api/nodes').flush(NODES);
    backend.expectOne(`/api/cycles/${cycle.id}`).flush(cycle);
    await fixture.whenStable();
  }

  async function errorsOf(label: string): Promise<string[]> {
    return (await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }))).getTextErrors();
  }

  const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';

  it('edit: fills the form from the cycle, instants split into UTC date and time', async () => {
    await openExisting();
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=code]' }))).getValue()).toBe('2027A');
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=callClosesDate]' }))).getValue()).toBe(
      '2027-01-15',
    );
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=callClosesTime]' }))).getValue()).toBe(
      '23:59',
    );
    expect(text()).toContain('Open clusters');
    expect(fixture.nativeElement.querySelector('[data-testid=closes-local] time').getAttribute('datetime')).toBe(
      '2027-01-15T23:59:00Z',
    );
  });

  it("save: PUTs the version read, and the server's field errors appear under their fields", async () => {
    await openExisting();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    const put = backend.expectOne('/api/cycles/7');
    expect(put.request.method).toBe('PUT');
    expect(put.request.body.version).toBe(3);
    expect(put.request.body.cycle).toEqual({
      code: '2027A',
      title: 'Lantern season',
      callOpensAt: '2026-11-01T12:00:00Z',
      callClosesAt: '2027-01-15T23:59:00Z',
      campaignStart: '2027-03-01',
      campaignEnd: '2027-08-31',
      anonymousReview: true,
      categories: ['Open clusters', 'Field stars'],
      nodes: [{ nodeId: 1, nodeHoursAvailable: 400 }],
    });
    put.flush(
      {
        code: 'validation_failed',
        message: 'Some fields need attention.',
        fieldErrors: {
          'cycle.code': ['another cycle already uses this code'],
          'cycle.callClosesAt': ['the call must close after it opens'],
          'cycle.nodes.0.nodeHoursAvailable': ['more than the node can offer in the campaign'],
        },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();

    expect(await errorsOf('Code')).toEqual(['another cycle already uses this code']);
    expect(await errorsOf('Call closes: date (UTC)')).toEqual(['the call must close after it opens']);
    expect(await errorsOf('Available (node-hours)')).toEqual(['more than the node can offer in the campaign']);
    expect(await errorsOf('Title')).toEqual([]);
    expect(fixture.nativeElement.querySelector('[data-testid=server-error]').textContent).toContain('Some fields need attention.');
    expect(navigateByUrl).not.toHaveBeenCalled();
  });

  it('409: keeps what was typed, shows the reload banner, and Reload brings the new version', async () => {
    await openExisting();
    const title = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=title]' }));
    await title.setValue('Lantern season, extended');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    backend
      .expectOne('/api/cycles/7')
      .flush({ code: 'version_conflict', message: 'The cycle changed since you opened it.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();

    const banner = fixture.nativeElement.querySelector('[data-testid=conflict-banner]') as HTMLElement;
    expect(banner.textContent).toContain('Someone else changed this cycle; reload');
    expect(await title.getValue()).toBe('Lantern season, extended');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).isDisabled()).toBe(true);

    // A native click: the harness would wait for stability, which the pending reload prevents.
    (banner.querySelector('button') as HTMLButtonElement).click();
    TestBed.tick();
    backend.expectOne('/api/cycles/7').flush({ ...CYCLE, title: 'Lantern season (revised)', version: 4 });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=conflict-banner]')).toBeNull();
    expect(await title.getValue()).toBe('Lantern season (revised)');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    expect(backend.expectOne('/api/cycles/7').request.body.version).toBe(4);
  });

  it('new: the shared schema refuses an empty form before anything is sent', async () => {
    TestBed.tick();
    backend.expectOne('/api/nodes').flush(NODES);
    await fixture.whenStable();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create cycle' }))).click();
    backend.expectNone((req) => req.method === 'POST');
    expect(await errorsOf('Code')).toEqual(['give the cycle a short code']);
    expect(await errorsOf('Science categories')).toEqual(['list at least one science category']);
    expect(await errorsOf('Call opens: date (UTC)')).toEqual(['Enter a date and a time (UTC)']);
    expect(await errorsOf('First night')).toEqual(['Enter a date']);
    expect(await errorsOf('Node 1')).toEqual(['Choose a node']);
  });

  it('toFormErrorPaths: strips the PUT prefix and sends instants to their date inputs', () => {
    expect(
      toFormErrorPaths({ 'cycle.callOpensAt': ['a'], callClosesAt: ['b'], 'categories.2': ['c'], 'nodes.1.nodeId': ['d'], nodes: ['e'] }),
    ).toEqual({ callOpensDate: ['a'], callClosesDate: ['b'], categories: ['c'], 'nodes.1.nodeId': ['d'], nodes: ['e'] });
  });
});
