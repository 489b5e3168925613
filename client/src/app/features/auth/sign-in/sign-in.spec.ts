import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter, Router } from '@angular/router';
import { testUser } from '../../../../testing/session';
import { SessionAuth } from '../../../core/auth/session-auth';
import SignIn from './sign-in';

describe('SignIn', () => {
  let fixture: ComponentFixture<SignIn>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let navigateByUrl: jest.SpyInstance;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    navigateByUrl = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    fixture = TestBed.createComponent(SignIn);
    fixture.componentRef.setInput('returnUrl', '/network?sort=code');
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function fillAndSubmit(email: string, password: string): Promise<void> {
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=email]' }))).setValue(email);
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=password]' }))).setValue(password);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
  }

  it('valid form: posts the credentials, signs in and returns to the wanted page', async () => {
    await fillAndSubmit('Orla.Venn@example.org', 'a long passphrase');
    const req = backend.expectOne('/api/auth/sign-in');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'Orla.Venn@example.org', password: 'a long passphrase' });
    req.flush({ user: testUser(['proposer']) });
    await fixture.whenStable();
    expect(TestBed.inject(SessionAuth).signedIn()).toBe(true);
    expect(navigateByUrl).toHaveBeenCalledWith('/network?sort=code');
  });

  it('server refuses: shows its message and stays on the page', async () => {
    await fillAndSubmit('orla.venn@example.org', 'not the password');
    backend
      .expectOne('/api/auth/sign-in')
      .flush(
        { code: 'invalid_credentials', message: 'The e-mail address or the password is wrong.' },
        { status: 401, statusText: 'Unauthorized' },
      );
    await fixture.whenStable();
    const alert = fixture.nativeElement.querySelector('[data-testid=server-error]') as HTMLElement;
    expect(alert.textContent).toContain('The e-mail address or the password is wrong.');
    expect(navigateByUrl).not.toHaveBeenCalled();
    expect(TestBed.inject(SessionAuth).signedIn()).toBe(false);
  });

  it('invalid e-mail: sends nothing and explains under the field', async () => {
    await fillAndSubmit('not-an-address', 'a long passphrase');
    backend.expectNone('/api/auth/sign-in');
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'E-mail' }));
    expect(await field.getTextErrors()).toEqual(['Enter a valid e-mail address']);
  });

  it('open redirect: an external returnUrl is replaced by home', async () => {
    fixture.componentRef.setInput('returnUrl', '//elsewhere.example.net/phish');
    await fixture.whenStable();
    await fillAndSubmit('orla.venn@example.org', 'a long passphrase');
    backend.expectOne('/api/auth/sign-in').flush({ user: testUser(['proposer']) });
    await fixture.whenStable();
    expect(navigateByUrl).toHaveBeenCalledWith('/');
  });
});
