import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatDialog, MatDialogRef } from '@angular/material/dialog';
import { ConflictDialog, ConflictDialogData } from './conflict-dialog';

@Component({ changeDetection: ChangeDetectionStrategy.OnPush, template: '' })
class Opener {}

describe('ConflictDialog', () => {
  let fixture: ComponentFixture<Opener>;
  let backend: HttpTestingController;
  let ref: MatDialogRef<ConflictDialog, boolean>;
  let closedWith: boolean | undefined | 'open';
  const host = () => document.getElementById(ref.id) as HTMLElement;
  const declare = () => Array.from(host().querySelectorAll('button')).find((b) => b.textContent?.trim() === 'Declare conflict')!;

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [Opener], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Opener);
    const data: ConflictDialogData = { proposalId: 41, title: 'Spin-down in an invented cluster' };
    ref = TestBed.inject(MatDialog).open<ConflictDialog, ConflictDialogData, boolean>(ConflictDialog, { data });
    closedWith = 'open';
    ref.beforeClosed().subscribe((result) => (closedWith = result));
    await fixture.whenStable();
  });
  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

  async function typeReason(text: string): Promise<void> {
    const reason = host().querySelector('textarea')!;
    reason.value = text;
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }

  it('no reason: nothing is sent and the field says what is missing', async () => {
    declare().click();
    await fixture.whenStable();
    backend.expectNone('/api/review/my/41/conflict');
    expect(host().querySelector('mat-error')?.textContent).toContain('Give a reason');
    expect(closedWith).toBe('open');
  });

  it('a refusal: busy while sent, then the server’s message as an alert and the button back on; the dialog stays open', async () => {
    await typeReason('I supervised the PI until last year.');
    declare().click();
    await fixture.whenStable();
    const req = backend.expectOne('/api/review/my/41/conflict');
    expect(host().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Declaring the conflict');
    expect(declare().disabled).toBe(true);
    req.flush({ code: 'review_locked', message: 'The grades of this cycle are locked.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(host().querySelector('[role=alert]')?.textContent?.trim()).toBe('The grades of this cycle are locked.');
    expect(host().querySelector('mat-progress-bar')).toBeNull();
    expect(declare().disabled).toBe(false);
    expect(closedWith).toBe('open');
  });

  it('recorded: sends the trimmed reason and closes with true', async () => {
    await typeReason('  A recent collaboration.  ');
    declare().click();
    const req = backend.expectOne('/api/review/my/41/conflict');
    expect(req.request.body).toEqual({ reason: 'A recent collaboration.' });
    req.flush({ proposalId: 41, declaredAt: '2027-01-21T10:00:00Z' });
    await fixture.whenStable();
    expect(closedWith).toBe(true);
  });

  it('Cancel closes with false and sends nothing', async () => {
    (Array.from(host().querySelectorAll('button')).find((b) => b.textContent?.trim() === 'Cancel') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(closedWith).toBe(false);
  });
});
