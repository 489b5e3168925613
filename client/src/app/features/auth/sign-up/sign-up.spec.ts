import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter, Router } from '@angular/router';
import { PASSWORD_MIN_LENGTH, SIGN_UP_ACCEPTED_MESSAGE } from '@spincycle/shared/accounts/account-schemas';
import { SessionAuth } from '../../../core/auth/session-auth';
import SignUp from './sign-up';

describe('SignUp', () => {
  let fixture: ComponentFixture<SignUp>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let navigateByUrl: jest.SpyInstance;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SignUp],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    navigateByUrl = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    fixture = TestBed.createComponent(SignUp);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function fill(values: Record<string, string>): Promise<void> {
    for (const [name, value] of Object.entries(values)) {
      await (await loader.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }))).setValue(value);
    }
  }

  const VALID = {
    displayName: 'Tamsin Rook',
    affiliation: 'Brackenfield Consortium',
    email: 'tamsin.rook@example.org',
    password: 'x'.repeat(PASSWORD_MIN_LENGTH),
  };

  it("server's fieldErrors: each message appears under its own field", async () => {
    await fill(VALID);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create account' }))).click();
    backend.expectOne('/api/auth/sign-up').flush(
      {
        code: 'validation_failed',
        message: 'Some fields need attention.',
        fieldErrors: { email: ['An account already uses this address'], displayName: ['Use at most 120 characters'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();

    const email = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'E-mail' }));
    const name = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Name' }));
    const password = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Password' }));
    expect(await email.getTextErrors()).toEqual(['An account already uses this address']);
    expect(await name.getTextErrors()).toEqual(['Use at most 120 characters']);
    expect(await password.getTextErrors()).toEqual([]);
    expect(fixture.nativeElement.querySelector('[data-testid=server-error]').textContent).toContain('Some fields need attention.');
    expect(navigateByUrl).not.toHaveBeenCalled();
  });

  it('editing a field clears its server message', async () => {
    await fill(VALID);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create account' }))).click();
    backend
      .expectOne('/api/auth/sign-up')
      .flush(
        { code: 'validation_failed', message: 'Check the form.', fieldErrors: { email: ['An account already uses this address'] } },
        { status: 400, statusText: 'Bad Request' },
      );
    await fill({ email: 'tamsin.rook2@example.org' });
    const email = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'E-mail' }));
    expect(await email.getTextErrors()).toEqual([]);
  });

  it('short password: refused in the form with the shared schema message, nothing sent', async () => {
    await fill({ ...VALID, password: 'short' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create account' }))).click();
    backend.expectNone('/api/auth/sign-up');
    const password = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Password' }));
    expect(await password.getTextErrors()).toEqual([`Use at least ${PASSWORD_MIN_LENGTH} characters`]);
  });

  it('accepted: posts the account, shows "check your inbox" with a sign-in link, stays signed out', async () => {
    await fill(VALID);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create account' }))).click();
    const req = backend.expectOne('/api/auth/sign-up');
    expect(req.request.body).toEqual(VALID);
    req.flush({ message: SIGN_UP_ACCEPTED_MESSAGE }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    const panel = fixture.nativeElement.querySelector('[data-testid=sign-up-accepted]') as HTMLElement;
    expect(panel.textContent).toContain(SIGN_UP_ACCEPTED_MESSAGE);
    expect(panel.querySelector('a')?.getAttribute('href')).toBe('/sign-in');
    expect(fixture.nativeElement.querySelector('form')).toBeNull();
    expect(TestBed.inject(SessionAuth).signedIn()).toBe(false);
    expect(navigateByUrl).not.toHaveBeenCalled();
  });

  it('with ?invite=: says so, and after sign-up the sign-in link continues to the invitation page', async () => {
    fixture.componentRef.setInput('invite', 'k3X9-lantern-invite-token-0042');
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=invite-note]').textContent).toContain(
      'You have been invited to join a proposal team.',
    );
    const signIn = Array.from(fixture.nativeElement.querySelectorAll('a') as NodeListOf<HTMLAnchorElement>).find((a) =>
      a.textContent?.includes('I already have an account'),
    );
    expect(signIn?.getAttribute('href')).toBe('/sign-in?returnUrl=%2Finvitations%2Fk3X9-lantern-invite-token-0042');

    await fill(VALID);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create account' }))).click();
    backend.expectOne('/api/auth/sign-up').flush({ message: SIGN_UP_ACCEPTED_MESSAGE }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    const next = fixture.nativeElement.querySelector('[data-testid=sign-up-accepted] a') as HTMLAnchorElement;
    expect(next.getAttribute('href')).toBe('/sign-in?returnUrl=%2Finvitations%2Fk3X9-lantern-invite-token-0042');
  });
});
