import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatRowHarness } from '@angular/material/table/testing';
import type { OutboxMail, OutboxPage } from '@spincycle/shared/mail/mail-outbox';
import MailOutbox, { mailStateText } from './mail-outbox';

const isList = (req: { url: string; method: string }) => req.method === 'GET' && req.url === '/api/admin/mail-outbox';

function mail(id: number, overrides: Partial<OutboxMail> = {}): OutboxMail {
  return {
    id,
    createdAt: '2027-02-20T09:15:00.000Z',
    kind: 'submission',
    to: [`person${id}@example.org`],
    subject: `Proposal submitted: “Spin survey ${id}” (R1)`,
    state: 'pending',
    attempts: 0,
    nextAttemptAt: '2027-02-20T09:16:00.000Z',
    lastError: null,
    sentAt: null,
    ...overrides,
  };
}

const FAILED = mail(7, {
  kind: 'password_reset',
  subject: 'Reset your Spincycle password',
  state: 'failed',
  attempts: 8,
  nextAttemptAt: null,
  lastError: 'The mail server could not be reached (it refused the connection).',
});
const RETRYING = mail(6, { kind: 'review_assignment', attempts: 2, lastError: 'The mail server did not answer in time.' });

describe('MailOutbox', () => {
  let fixture: ComponentFixture<MailOutbox>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let snackOpen: jest.Mock;

  beforeEach(async () => {
    snackOpen = jest.fn();
    TestBed.configureTestingModule({
      imports: [MailOutbox],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: snackOpen } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MailOutbox);
    loader = TestbedHarnessEnvironment.loader(fixture);
    // Not whenStable(): the list request is a pending task until a test answers it.
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  async function answerList(page: OutboxPage): Promise<TestRequest> {
    const req = backend.expectOne(isList);
    req.flush(page);
    await fixture.whenStable();
    return req;
  }

  const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';

  it('first load: asks for the mails not sent yet, page 1 of 25, and shows them in words', async () => {
    const req = await answerList({ items: [FAILED, RETRYING], total: 2 });
    expect(req.request.params.get('state')).toBe('unsent');
    expect(req.request.params.get('page')).toBe('1');
    expect(req.request.params.get('pageSize')).toBe('25');

    const rows = await loader.getAllHarnesses(MatRowHarness);
    expect(rows).toHaveLength(2);
    const failed = await rows[0].getCellTextByColumnName();
    expect(failed['to']).toBe('person7@example.org');
    expect(failed['subject']).toBe('Reset your Spincycle password');
    expect(failed['kind']).toBe('Password reset link');
    expect(failed['state']).toBe('Not sent, gave up');
    expect(failed['attempts']).toBe('8');
    expect(failed['lastError']).toBe('The mail server could not be reached (it refused the connection).');
    const retrying = await rows[1].getCellTextByColumnName();
    expect(retrying['kind']).toBe('Proposals to review');
    expect(retrying['state']).toContain('Waiting to be tried again');
    expect(retrying['state']).toContain('next try');
    // No code keys on screen.
    expect(text()).not.toContain('password_reset');
    expect(text()).not.toContain('review_assignment');
  });

  it('"Send again" only on failed mails; it posts, waits for the answer and shows the mail as sent', async () => {
    await answerList({ items: [FAILED, RETRYING], total: 2 });
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[data-testid^=resend-]' }))).toHaveLength(1);
    const button = await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=resend-7]' }));
    expect(await button.getText()).toContain('Send again');

    await button.click();
    const post = backend.expectOne('/api/admin/mail-outbox/7/resend');
    expect(post.request.method).toBe('POST');
    expect(await button.isDisabled()).toBe(true);
    post.flush({ ...FAILED, state: 'sent', attempts: 1, lastError: null, sentAt: '2027-02-20T10:00:00.000Z' });
    await fixture.whenStable();

    const first = await (await loader.getAllHarnesses(MatRowHarness))[0].getCellTextByColumnName();
    expect(first['state']).toContain('Sent');
    expect(first['lastError']).toBe('None');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[data-testid^=resend-]' }))).toHaveLength(0);
    expect(text()).toContain('“Reset your Spincycle password” was sent to person7@example.org.');
  });

  it('"Send again" while the mail server is still down: says it will be tried again automatically', async () => {
    await answerList({ items: [FAILED], total: 1 });
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=resend-7]' }))).click();
    backend
      .expectOne('/api/admin/mail-outbox/7/resend')
      .flush({ ...FAILED, state: 'pending', attempts: 1, nextAttemptAt: '2027-02-20T10:01:00.000Z' });
    await fixture.whenStable();
    expect(text()).toContain(
      'is not sent yet: The mail server could not be reached (it refused the connection). It will be tried again automatically.',
    );
  });

  it('a refused "Send again" keeps the row and tells why', async () => {
    await answerList({ items: [FAILED], total: 1 });
    const button = await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=resend-7]' }));
    await button.click();
    backend
      .expectOne('/api/admin/mail-outbox/7/resend')
      .flush(
        { code: 'mail_not_failed', message: 'Mail 7 can be sent again only after it failed: it was sent already' },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(snackOpen).toHaveBeenCalledWith(
      '“Reset your Spincycle password” was not sent again: Mail 7 can be sent again only after it failed: it was sent already',
      'Dismiss',
      expect.anything(),
    );
    expect(await button.isDisabled()).toBe(false);
  });

  it('the filter reloads from page 1 with the chosen state', async () => {
    await answerList({ items: [FAILED], total: 1 });
    await (await loader.getHarness(MatSelectHarness)).open();
    // A native click: a harness click would wait for the reload, which only this test can answer.
    const options = [...document.querySelectorAll<HTMLElement>('mat-option')];
    expect(options.map((o) => o.textContent?.trim())).toEqual([
      'Not sent yet',
      'Not sent, gave up',
      'Waiting to be sent',
      'Being sent now',
      'Sent',
      'All mail',
    ]);
    options.find((o) => o.textContent?.trim() === 'Sent')!.click();
    TestBed.tick();
    const req = await answerList({ items: [], total: 0 });
    expect(req.request.params.get('state')).toBe('sent');
    expect(req.request.params.get('page')).toBe('1');
    expect(text()).toContain('No mail is in this state.');
  });

  it('empty: says every mail has been sent', async () => {
    await answerList({ items: [], total: 0 });
    expect(text()).toContain('Every mail has been sent: none is waiting or has failed.');
    expect(await loader.getAllHarnesses(MatRowHarness)).toHaveLength(0);
  });

  it('error: says the list could not be loaded, with the server’s reason, and offers to try again', async () => {
    backend
      .expectOne(isList)
      .flush({ code: 'forbidden', message: 'This needs the administrator role' }, { status: 403, statusText: 'Forbidden' });
    await fixture.whenStable();
    expect(text()).toContain('The outgoing mail could not be loaded. This needs the administrator role');
    const retry = [...(fixture.nativeElement as HTMLElement).querySelectorAll('button')].find(
      (b) => b.textContent?.trim() === 'Try again',
    )!;
    retry.click();
    TestBed.tick();
    await answerList({ items: [], total: 0 });
    expect(text()).not.toContain('could not be loaded');
  });
});

describe('mailStateText', () => {
  it('words each state (a first wait differs from a retry)', () => {
    expect(mailStateText({ state: 'pending', attempts: 0 })).toBe('Waiting to be sent');
    expect(mailStateText({ state: 'pending', attempts: 3 })).toBe('Waiting to be tried again');
    expect(mailStateText({ state: 'sending', attempts: 1 })).toBe('Being sent now');
    expect(mailStateText({ state: 'sent', attempts: 1 })).toBe('Sent');
    expect(mailStateText({ state: 'failed', attempts: 8 })).toBe('Not sent, gave up');
  });
});
