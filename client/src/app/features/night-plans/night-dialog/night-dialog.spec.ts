import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MAT_DIALOG_DATA, MatDialog, MatDialogRef } from '@angular/material/dialog';
import { of } from 'rxjs';
import { LostNightDialog } from '../lost-night-dialog/lost-night-dialog';
import { programColours } from '../night-plan-format';
import { testBuild, testNight, testOverview } from '../testing/night-plan-fixtures';
import { NightDialog, type NightDialogData } from './night-dialog';

const URL = '/api/night-plans/cycles/7/nodes/3/nights/2027-03-03';

describe('NightDialog', () => {
  let fixture: ComponentFixture<NightDialog>;
  let backend: HttpTestingController;
  let data: NightDialogData;
  const close = jest.fn();
  const el = () => fixture.nativeElement as HTMLElement;

  async function render(): Promise<void> {
    close.mockReset();
    data = {
      cycleId: 7,
      nodeId: 3,
      nodeCode: 'KRG-50',
      date: '2027-03-03',
      colours: programColours(testOverview().programs),
      changed: jest.fn(),
      replanned: jest.fn(),
    };
    TestBed.configureTestingModule({
      imports: [NightDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NightDialog);
    TestBed.tick();
  }
  afterEach(() => backend.verify());
  const text = (sel: string) => el().querySelector(sel)!.textContent!.replace(/\s+/g, ' ').trim();

  it('lists the visits in order with UTC and site times, altitude, airmass and status', async () => {
    await render();
    backend.expectOne(URL).flush(testNight());
    await fixture.whenStable();
    expect(text('h2')).toBe('Night of 3 Mar 2027 · KRG-50');
    expect(text('[data-testid=night-summary]')).toContain('Dark from 20:02 to 05:58 site time (23:02–08:58 UTC). Moon 80 % lit.');
    const rows = [...el().querySelectorAll('[data-testid=night-visits] tbody tr')] as HTMLElement[];
    expect(rows.map((r) => r.dataset['testid'])).toEqual(['visit-row-103', 'visit-row-104']);
    const first = rows[0].textContent!.replace(/\s+/g, ' ');
    expect(first).toContain('Quill-2');
    expect(first).toContain('01:30–02:30');
    expect(rows[0].querySelector('[data-testid=local-time]')?.textContent).toBe('22:30–23:30');
    expect(first).toContain('62°');
    expect(first).toContain('1.13');
    expect(first).toContain('Planned');
    expect(text('[data-testid=status-104]')).toContain('Done');
    expect(el().querySelector('thead')!.textContent).toContain('Site time (Etc/GMT+3)');
  });

  it('mark done sends the PUT and shows the new status', async () => {
    await render();
    backend.expectOne(URL).flush(testNight());
    await fixture.whenStable();
    (el().querySelector('[data-testid=mark-done-103]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/night-plans/visits/103');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ status: 'done' });
    req.flush({});
    await fixture.whenStable();
    expect(text('[data-testid=status-103]')).toContain('Done');
    expect((el().querySelector('[data-testid=mark-done-103]') as HTMLButtonElement).disabled).toBe(true);
    expect(el().querySelector('[data-testid=mark-planned-103]')).not.toBeNull();
    expect(data.changed).toHaveBeenCalledTimes(1);
  });

  it('a refused change keeps the status and says why beside the visit', async () => {
    await render();
    backend.expectOne(URL).flush(testNight());
    await fixture.whenStable();
    (el().querySelector('[data-testid=mark-missed-103]') as HTMLButtonElement).click();
    backend
      .expectOne('/api/night-plans/visits/103')
      .flush({ code: 'x', message: 'The visit is on a lost night.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(text('[data-testid=status-103]')).toContain('Planned');
    expect(text('[data-testid=visit-row-103] [role=alert]')).toBe('Not changed: The visit is on a lost night.');
    expect(data.changed).not.toHaveBeenCalled();
  });

  it('"Mark this night lost" opens the lost-night dialog; its re-plan goes to the page and the dialog closes', async () => {
    await render();
    backend.expectOne(URL).flush(testNight());
    await fixture.whenStable();
    const replan = testBuild({ kind: 'replan', state: 'queued', done: 0, total: 0, fromNight: '2027-03-03' });
    const open = jest.spyOn(TestBed.inject(MatDialog), 'open').mockReturnValue({ afterClosed: () => of(replan) } as never);
    (el().querySelector('[data-testid=mark-night-lost]') as HTMLButtonElement).click();
    expect(open).toHaveBeenCalledWith(
      LostNightDialog,
      expect.objectContaining({ data: expect.objectContaining({ date: '2027-03-03', nodeId: 3 }) }),
    );
    expect(data.replanned).toHaveBeenCalledWith(replan);
    expect(close).toHaveBeenCalled();
  });

  it('a lost night says so, with no visits and no second "lost" button', async () => {
    await render();
    backend
      .expectOne(URL)
      .flush(
        testNight({ lost: { reason: 'Cloud over the ridge', markedBy: 'Ines Farrow', markedAt: '2027-03-04T10:00:00Z' }, visits: [] }),
      );
    await fixture.whenStable();
    expect(text('[data-testid=night-lost]')).toContain(
      'This night was marked lost: Cloud over the ridge (Ines Farrow, 4 Mar 2027, 10:00 UTC)',
    );
    expect(el().textContent).toContain('Nothing is planned on a lost night.');
    expect(el().querySelector('[data-testid=mark-night-lost]')).toBeNull();
  });
});
