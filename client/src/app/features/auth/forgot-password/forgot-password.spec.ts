import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter } from '@angular/router';
import ForgotPassword, { RESET_REQUESTED_MESSAGE } from './forgot-password';

describe('ForgotPassword', () => {
  it('sends the address and shows the same confirmation whatever the server knows', async () => {
    TestBed.configureTestingModule({
      imports: [ForgotPassword],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(ForgotPassword);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=reset-sent]')).toBeNull();

    await (await loader.getHarness(MatInputHarness)).setValue('nell.ashby@example.org');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send the link' }))).click();
    const req = backend.expectOne('/api/auth/password-reset');
    expect(req.request.body).toEqual({ email: 'nell.ashby@example.org' });
    req.flush(null, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();

    expect(fixture.nativeElement.querySelector('[data-testid=reset-sent]').textContent).toContain(RESET_REQUESTED_MESSAGE);
    expect(RESET_REQUESTED_MESSAGE).toBe('If an account exists for that address, a link is on its way.');
    expect(fixture.nativeElement.querySelector('form')).toBeNull();
    backend.verify();
  });
});
