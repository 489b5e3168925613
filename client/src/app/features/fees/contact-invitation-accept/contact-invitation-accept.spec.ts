import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { testUser } from '../../../../testing/session';
import { SessionAuth } from '../../../core/auth/session-auth';
import ContactInvitationAccept from './contact-invitation-accept';

const TOKEN = 'Xq7-billing-invite-token-00421';
const URL = `/api/billing/contact-invitations/${TOKEN}`;

describe('ContactInvitationAccept', () => {
  let fixture: ComponentFixture<ContactInvitationAccept>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (id: string) => el().querySelector(`[data-testid=${id}]`) as HTMLElement | null;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [ContactInvitationAccept],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ContactInvitationAccept);
  });

  afterEach(() => backend.verify());

  it('accepts with the token, names the program, links to Fees and reads the session again (the new role)', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    TestBed.tick();
    fixture.detectChanges();
    const req = backend.expectOne(URL);
    expect(req.request.method).toBe('POST');
    expect(el().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Accepting the invitation');
    req.flush({ proposalId: 5, programTitle: 'Spin-down of an invented cluster' });
    backend.expectOne('/api/auth/session').flush({ user: testUser(['proposer', 'billing_contact']) });
    await fixture.whenStable();
    expect(q('billing-invitation-accepted')?.textContent).toContain('You are now a billing contact of “Spin-down of an invented cluster”.');
    const fees = [...el().querySelectorAll('a')].find((a) => a.textContent?.trim() === 'Your fees');
    expect(fees?.getAttribute('href')).toBe('/fees');
    expect(TestBed.inject(SessionAuth).hasRole('billing_contact')).toBe(true);
  });

  it('404 and 403: the server’s sentence as an alert, nothing accepted', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    TestBed.tick();
    backend.expectOne(URL).flush(
      {
        code: 'invitation_not_found',
        message: 'This invitation link is not valid any more (used, replaced or older than 14 days). Ask for a new one.',
      },
      { status: 404, statusText: 'Not Found' },
    );
    await fixture.whenStable();
    expect(q('billing-invitation-error')?.getAttribute('role')).toBe('alert');
    expect(q('billing-invitation-error')?.textContent).toContain('This invitation link is not valid any more');
    expect(q('billing-invitation-accepted')).toBeNull();

    fixture.componentRef.setInput('token', `${TOKEN}b`);
    TestBed.tick();
    backend.expectOne(`${URL}b`).flush(
      {
        code: 'invitation_other_address',
        message: 'This invitation was sent to accounts@fernwick.example. Sign in with that address to accept it.',
      },
      { status: 403, statusText: 'Forbidden' },
    );
    await fixture.whenStable();
    expect(q('billing-invitation-error')?.textContent).toContain('Sign in with that address to accept it.');
  });

  it('a truncated link is refused here, without asking the server', async () => {
    fixture.componentRef.setInput('token', 'short');
    await fixture.whenStable();
    backend.expectNone(() => true);
    expect(q('billing-invitation-error')?.textContent).toContain('This invitation link is incomplete.');
  });
});
