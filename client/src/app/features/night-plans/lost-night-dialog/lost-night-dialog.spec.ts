import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { testBuild } from '../testing/night-plan-fixtures';
import { LostNightDialog, type LostNightDialogData } from './lost-night-dialog';

const DATA: LostNightDialogData = { cycleId: 7, nodeId: 3, nodeCode: 'KRG-50', date: '2027-03-03', dateText: '3 Mar 2027' };

describe('LostNightDialog', () => {
  let fixture: ComponentFixture<LostNightDialog>;
  let backend: HttpTestingController;
  const close = jest.fn();
  const el = () => fixture.nativeElement as HTMLElement;

  beforeEach(async () => {
    close.mockReset();
    TestBed.configureTestingModule({
      imports: [LostNightDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: DATA },
        { provide: MatDialogRef, useValue: { close } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LostNightDialog);
    await fixture.whenStable();
  });
  afterEach(() => backend.verify());

  function type(text: string): void {
    const area = el().querySelector('[data-testid=lost-reason]') as HTMLTextAreaElement;
    area.value = text;
    area.dispatchEvent(new Event('input'));
  }
  async function submit(): Promise<void> {
    (el().querySelector('[data-testid=lost-submit]') as HTMLButtonElement).click();
    await fixture.whenStable();
  }

  it('warns that the later nights are re-planned and done visits never move', () => {
    const caution = el().querySelector('[data-testid=lost-caution]')!.textContent!;
    expect(caution).toContain('remaining nights of KRG-50 are planned again from this night on');
    expect(caution).toContain('Visits marked done never move');
  });

  it('requires a reason: a blank one sends nothing and says why', async () => {
    type('   ');
    await submit();
    backend.expectNone(() => true);
    expect(el().querySelector('mat-error')?.textContent).toContain('Say why the night was lost');
    expect(close).not.toHaveBeenCalled();
  });

  it('sends the date and the trimmed reason, and closes with the re-plan', async () => {
    type('  Cloud over the ridge ');
    await submit();
    const req = backend.expectOne('/api/night-plans/cycles/7/nodes/3/lost-nights');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ date: '2027-03-03', reason: 'Cloud over the ridge' });
    const replan = testBuild({ id: 41, kind: 'replan', state: 'queued', done: 0, total: 0, fromNight: '2027-03-03', finishedAt: null });
    req.flush(replan);
    expect(close).toHaveBeenCalledWith(replan);
  });

  it('a refusal stays in the dialog with the server’s words', async () => {
    type('Fault in the dome');
    await submit();
    backend
      .expectOne('/api/night-plans/cycles/7/nodes/3/lost-nights')
      .flush({ code: 'invalid', message: 'The night is already lost.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=lost-error]')?.textContent).toContain('The night is already lost.');
    expect(close).not.toHaveBeenCalled();
  });
});
