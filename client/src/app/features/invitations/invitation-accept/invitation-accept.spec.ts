import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import InvitationAccept from './invitation-accept';

const TOKEN = 'k3X9-lantern-invite-token-0042';

describe('InvitationAccept', () => {
  let fixture: ComponentFixture<InvitationAccept>;
  let backend: HttpTestingController;
  let navigate: jest.SpyInstance;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [InvitationAccept],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    fixture = TestBed.createComponent(InvitationAccept);
  });

  afterEach(() => backend.verify());

  it('accepts with the token from the link, then opens the proposal in place of this page', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    const req = backend.expectOne('/api/invitations/accept');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ token: TOKEN });
    req.flush({ proposalId: 17 });
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledWith(['/proposals', 17], { replaceUrl: true });
  });

  it('refused: shows the server message and a way to the proposals', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    backend
      .expectOne('/api/invitations/accept')
      .flush({ code: 'already_member', message: 'You are already on the team of this proposal' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=invitation-error]').textContent).toContain(
      'You are already on the team of this proposal',
    );
    expect(fixture.nativeElement.textContent).toContain('You are on that team already');
    expect(navigate).not.toHaveBeenCalled();
  });

  it('a truncated link is refused here, without asking the server', async () => {
    fixture.componentRef.setInput('token', 'short');
    await fixture.whenStable();
    backend.expectNone('/api/invitations/accept');
    expect(fixture.nativeElement.textContent).toContain('This invitation link is incomplete.');
  });
});
