import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { provideRouter, Router } from '@angular/router';
import ResetPassword from './reset-password';

const TOKEN = 'k'.repeat(40);

describe('ResetPassword', () => {
  let fixture: ComponentFixture<ResetPassword>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let navigateByUrl: jest.SpyInstance;
  let snackOpen: jest.Mock;

  beforeEach(() => {
    snackOpen = jest.fn();
    TestBed.configureTestingModule({
      imports: [ResetPassword],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: snackOpen } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    navigateByUrl = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    fixture = TestBed.createComponent(ResetPassword);
    loader = TestbedHarnessEnvironment.loader(fixture);
  });

  afterEach(() => backend.verify());

  async function fill(password: string, repeat: string): Promise<void> {
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=password]' }))).setValue(password);
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=repeat]' }))).setValue(repeat);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Set the password' }))).click();
  }

  it('no token in the link: no form, a way to ask for a new link', async () => {
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('form')).toBeNull();
    expect(fixture.nativeElement.textContent).toContain('This link is incomplete.');
  });

  it('passwords differ: nothing is sent and the second field says why', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    await fill('first long password', 'second long password');
    backend.expectNone('/api/auth/password-reset/confirm');
    const repeat = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'New password again' }));
    expect(await repeat.getTextErrors()).toEqual(['The two passwords differ']);
  });

  it('accepted: posts token and password, then goes to sign-in with a message', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    await fill('a brand new password', 'a brand new password');
    const req = backend.expectOne('/api/auth/password-reset/confirm');
    expect(req.request.body).toEqual({ token: TOKEN, password: 'a brand new password' });
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(navigateByUrl).toHaveBeenCalledWith('/sign-in');
    expect(snackOpen).toHaveBeenCalledWith('Your password is changed. Sign in with the new one.', 'Dismiss', expect.anything());
  });

  it('expired token: shows the server message', async () => {
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    await fill('a brand new password', 'a brand new password');
    backend
      .expectOne('/api/auth/password-reset/confirm')
      .flush({ code: 'reset_token_invalid', message: 'This link has expired.' }, { status: 400, statusText: 'Bad Request' });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('.form-alert').textContent).toContain('This link has expired.');
    expect(navigateByUrl).not.toHaveBeenCalled();
  });
});
