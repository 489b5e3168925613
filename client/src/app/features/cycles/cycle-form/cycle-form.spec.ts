import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { provideRouter, Router } from '@angular/router';
import type { CycleSummary, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { formatLocalInstant } from '../../../ui/time/date-format';
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
  capacityOverrun: 'block',
  nodes: [{ nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 400 }],
};

const NODES = [
  { id: 1, code: 'KRG-50', name: 'Korrig fifty' },
  { id: 2, code: 'VHM-40', name: 'Vellham forty' },
] as TelescopeNode[];

describe('CycleForm', () => {
  let fixture: ComponentFixture<CycleForm>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
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
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
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
    expect(fixture.nativeElement.querySelector('[data-testid=closes-local] time').getAttribute('datetime')).toBe('2027-01-15T23:59:00Z');
    // The instant written once, in UTC; the time is a plain 24-hour text field, not a browser time picker.
    expect(fixture.nativeElement.querySelector('[data-testid=closes-utc]').textContent).toBe('15 Jan 2027, 23:59 UTC');
    // The person's own time only when it reads differently (none on a clock that reads as UTC).
    const local = formatLocalInstant('2027-01-15T23:59:00Z', 'en-US');
    expect(fixture.nativeElement.querySelector('[data-testid=closes-your-time]')?.textContent ?? '').toBe(local && `Your time: ${local}`);
    expect(fixture.nativeElement.querySelector('[formControlName=callClosesTime]').getAttribute('type')).not.toBe('time');
    expect(fixture.nativeElement.querySelector('[formControlName=callClosesDate]').getAttribute('type')).not.toBe('date');
    expect(await (await loader.getHarness(MatRadioGroupHarness)).getCheckedValue()).toBe('block');
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
      capacityOverrun: 'block',
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
    expect(await errorsOf('Call closes')).toEqual(['the call must close after it opens']);
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
    expect(await errorsOf('Call opens')).toEqual(['Enter a date (YYYY-MM-DD)']);
    expect(await errorsOf('First night')).toEqual(['Enter a date (YYYY-MM-DD)']);
    expect(await errorsOf('Node 1')).toEqual(['Choose a node']);
  });

  it('the campaign cannot start before the call closes: the error sits on First night and nothing is sent', async () => {
    await openExisting();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=campaignStart]' }))).setValue('2027-01-15');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    backend.expectNone('/api/cycles/7');
    const [message] = await errorsOf('First night');
    expect(message).toBe('the campaign cannot start before the call closes (15 Jan 2027, 23:59 UTC): first night 2027-01-16 or later');
  });

  it('times are typed HH:MM on the 24-hour clock; a 12-hour time is refused on the time field', async () => {
    await openExisting();
    const time = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=callClosesTime]' }));
    await time.setValue('11:59 PM');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    backend.expectNone('/api/cycles/7');
    expect(await errorsOf('Closes at')).toEqual(['Enter the time as HH:MM on the 24-hour clock, e.g. 23:59']);
    await time.setValue('18:30');
    expect(fixture.nativeElement.querySelector('[data-testid=closes-utc]').textContent).toBe('15 Jan 2027, 18:30 UTC');
  });

  it('a capacity cut below the submitted requests: 409, a confirmation listing node, request and capacity, then the same save with confirmCapacityCut', async () => {
    await openExisting();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=nodeHoursAvailable]' }))).setValue('300');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    const first = backend.expectOne('/api/cycles/7');
    expect(first.request.body.confirmCapacityCut).toBeUndefined();
    first.flush(
      {
        code: 'capacity_below_requests',
        message: 'The new capacity is below what submitted proposals request (KRG-50: 809.68 node-hours requested, new capacity 300).',
        fieldErrors: { 'cycle.nodes.0.nodeHoursAvailable': ['below the 809.68 node-hours submitted proposals request on KRG-50'] },
        nodes: [{ nodeCode: 'KRG-50', requestedNodeHours: 809.68, nodeHoursAvailable: 300 }],
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=conflict-banner]')).toBeNull();
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Cut capacity below the requests?');
    expect(await dialog.getContentText()).toContain('KRG-50: submitted proposals request 809.68 node-hours; the new capacity is 300.');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Cut capacity', selector: 'mat-dialog-actions button' }))).click();
    const again = backend.expectOne('/api/cycles/7');
    expect(again.request.body).toMatchObject({
      version: 3,
      confirmCapacityCut: true,
      cycle: { nodes: [{ nodeId: 1, nodeHoursAvailable: 300 }] },
    });
    again.flush({ ...CYCLE, version: 4, nodes: [{ nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 300 }] });
    await fixture.whenStable();
    expect(navigateByUrl).toHaveBeenCalledWith('/cycles');
  });

  it('a capacity cut declined: nothing more is sent and the form says it was not saved', async () => {
    await openExisting();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save cycle' }))).click();
    backend.expectOne('/api/cycles/7').flush(
      {
        code: 'capacity_below_requests',
        message: 'below',
        nodes: [{ nodeCode: 'KRG-50', requestedNodeHours: 500, nodeHoursAvailable: 400 }],
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    await (await root.getHarness(MatButtonHarness.with({ text: 'Cancel', selector: 'mat-dialog-actions button' }))).click();
    await fixture.whenStable();
    backend.expectNone('/api/cycles/7');
    expect(fixture.nativeElement.querySelector('[data-testid=server-error]').textContent).toContain('the capacity was not cut');
    expect(navigateByUrl).not.toHaveBeenCalled();
  });

  it('toFormErrorPaths: strips the PUT prefix and sends instants to their date inputs', () => {
    expect(
      toFormErrorPaths({ 'cycle.callOpensAt': ['a'], callClosesAt: ['b'], 'categories.2': ['c'], 'nodes.1.nodeId': ['d'], nodes: ['e'] }),
    ).toEqual({ callOpensDate: ['a'], callClosesDate: ['b'], categories: ['c'], 'nodes.1.nodeId': ['d'], nodes: ['e'] });
    // With the date there and the time wrong, the message goes to the time field.
    expect(
      toFormErrorPaths(
        { callClosesAt: ['x'] },
        { callOpensDate: '2027-01-01', callOpensTime: '00:00', callClosesDate: '2027-01-15', callClosesTime: '7pm' },
      ),
    ).toEqual({ callClosesTime: ['x'] });
  });
});
