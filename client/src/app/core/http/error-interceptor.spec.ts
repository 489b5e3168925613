import { HttpClient, HttpErrorResponse, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { provideRouter, Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { seedSession, testUser } from '../../../testing/session';
import { SessionAuth } from '../auth/session-auth';
import { errorInterceptor, SERVER_FAILURE_MESSAGE, UNREACHABLE_MESSAGE } from './error-interceptor';

describe('errorInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let snackOpen: jest.Mock;
  let navigate: jest.SpyInstance;

  beforeEach(async () => {
    snackOpen = jest.fn();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: snackOpen } },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    await seedSession(testUser(['proposer']));
  });

  afterEach(() => backend.verify());

  /** Sends a GET, answers it with `status`, and returns the error the caller received. */
  async function failWith(url: string, status: number, body: object | null = null): Promise<HttpErrorResponse> {
    const result = firstValueFrom(http.get(url));
    const req = backend.expectOne(url);
    if (status === 0) req.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    else req.flush(body, { status, statusText: 'Error' });
    return result.then(
      () => {
        throw new Error('expected the request to fail');
      },
      (error: HttpErrorResponse) => error,
    );
  }

  it('401 on an API call: forgets the session and goes to sign-in with the current URL', async () => {
    jest.spyOn(TestBed.inject(Router), 'url', 'get').mockReturnValue('/network');
    const error = await failWith('/api/nodes', 401, { code: 'unauthenticated', message: 'Sign in first.' });
    expect(error.status).toBe(401);
    expect(TestBed.inject(SessionAuth).user()).toBeNull();
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], { queryParams: { returnUrl: '/network' } });
  });

  it('401 on an /api/auth/ call: passes through, the session and the page stay', async () => {
    await failWith('/api/auth/sign-in', 401, { code: 'invalid_credentials', message: 'Wrong.' });
    expect(TestBed.inject(SessionAuth).user()).not.toBeNull();
    expect(navigate).not.toHaveBeenCalled();
    expect(snackOpen).not.toHaveBeenCalled();
  });

  it('no answer (status 0): says the server could not be reached', async () => {
    const error = await failWith('/api/cycles', 0);
    expect(error.status).toBe(0);
    expect(snackOpen).toHaveBeenCalledWith(UNREACHABLE_MESSAGE, 'Dismiss', expect.anything());
  });

  it('5xx: says something went wrong, and still hands the error to the page', async () => {
    const error = await failWith('/api/cycles', 503);
    expect(error.status).toBe(503);
    expect(snackOpen).toHaveBeenCalledWith(SERVER_FAILURE_MESSAGE, 'Dismiss', expect.anything());
  });

  it('503 with the API body (a service such as the card processor unavailable): no snackbar, the page shows its message', async () => {
    const body = { code: 'payment_provider_unavailable', message: 'The card processor cannot be reached just now.' };
    const error = await failWith('/api/billing/invoices/1/payments', 503, body);
    expect(error.error).toEqual(body);
    expect(snackOpen).not.toHaveBeenCalled();
  });

  it('other 4xx: no snackbar, the body with fieldErrors reaches the page untouched', async () => {
    const body = { code: 'validation_failed', message: 'Check the form.', fieldErrors: { email: ['Taken'] } };
    const error = await failWith('/api/admin/accounts', 400, body);
    expect(error.error).toEqual(body);
    expect(snackOpen).not.toHaveBeenCalled();
    expect(navigate).not.toHaveBeenCalled();
  });
});
