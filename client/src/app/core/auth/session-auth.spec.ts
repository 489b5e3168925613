import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { firstValueFrom } from 'rxjs';
import { SessionAuth } from './session-auth';

const REVIEWER: SessionUser = {
  id: 7,
  email: 'rhea.quill@example.org',
  displayName: 'Rhea Quill',
  affiliation: 'Lowmoor Observatory',
  roles: ['proposer', 'reviewer'],
};

describe('SessionAuth', () => {
  let auth: SessionAuth;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    auth = TestBed.inject(SessionAuth);
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  it('load: a signed-in session sets the user signal', async () => {
    const loaded = auth.load();
    const req = http.expectOne('/api/auth/session');
    expect(req.request.method).toBe('GET');
    req.flush({ user: REVIEWER });
    await expect(loaded).resolves.toEqual(REVIEWER);
    expect(auth.user()).toEqual(REVIEWER);
    expect(auth.signedIn()).toBe(true);
  });

  it('load: no session leaves the user null', async () => {
    const loaded = auth.load();
    http.expectOne('/api/auth/session').flush({ user: null });
    await expect(loaded).resolves.toBeNull();
    expect(auth.signedIn()).toBe(false);
  });

  it('load: an unreachable server resolves signed out instead of rejecting', async () => {
    const loaded = auth.load();
    http.expectOne('/api/auth/session').error(new ProgressEvent('error'), { status: 0 });
    await expect(loaded).resolves.toBeNull();
    expect(auth.user()).toBeNull();
  });

  it('signIn: posts the credentials and keeps the returned user', async () => {
    const result = firstValueFrom(auth.signIn({ email: 'rhea.quill@example.org', password: 'correct horse' }));
    const req = http.expectOne('/api/auth/sign-in');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'rhea.quill@example.org', password: 'correct horse' });
    req.flush({ user: REVIEWER });
    await expect(result).resolves.toEqual(REVIEWER);
    expect(auth.user()?.id).toBe(7);
  });

  it('signIn: a 401 leaves the person signed out and passes the error on', async () => {
    const result = firstValueFrom(auth.signIn({ email: 'rhea.quill@example.org', password: 'wrong' }));
    http
      .expectOne('/api/auth/sign-in')
      .flush({ code: 'invalid_credentials', message: 'The e-mail or password is wrong.' }, { status: 401, statusText: 'Unauthorized' });
    await expect(result).rejects.toMatchObject({ status: 401 });
    expect(auth.user()).toBeNull();
  });

  it('signOut: posts and clears the user on 204', async () => {
    const loaded = auth.load();
    http.expectOne('/api/auth/session').flush({ user: REVIEWER });
    await loaded;
    const done = firstValueFrom(auth.signOut(), { defaultValue: undefined });
    const req = http.expectOne('/api/auth/sign-out');
    expect(req.request.method).toBe('POST');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await done;
    expect(auth.user()).toBeNull();
  });

  it('requestReset and confirmReset: post to their endpoints with the given bodies', async () => {
    const requested = firstValueFrom(auth.requestReset({ email: 'ivo.marsh@example.org' }), { defaultValue: undefined });
    const reqA = http.expectOne('/api/auth/password-reset');
    expect(reqA.request.method).toBe('POST');
    expect(reqA.request.body).toEqual({ email: 'ivo.marsh@example.org' });
    reqA.flush(null, { status: 202, statusText: 'Accepted' });
    await requested;

    const confirmed = firstValueFrom(auth.confirmReset({ token: 't'.repeat(32), password: 'a new password' }), {
      defaultValue: undefined,
    });
    const reqB = http.expectOne('/api/auth/password-reset/confirm');
    expect(reqB.request.method).toBe('POST');
    expect(reqB.request.body).toEqual({ token: 't'.repeat(32), password: 'a new password' });
    reqB.flush(null, { status: 204, statusText: 'No Content' });
    await confirmed;
  });

  it('hasRole: true for any held role, false for others and when signed out', async () => {
    expect(auth.hasRole('proposer')).toBe(false);
    const loaded = auth.load();
    http.expectOne('/api/auth/session').flush({ user: REVIEWER });
    await loaded;
    expect(auth.hasRole('reviewer')).toBe(true);
    expect(auth.hasRole('administrator', 'reviewer')).toBe(true);
    expect(auth.hasRole('administrator')).toBe(false);
    auth.clear();
    expect(auth.hasRole('reviewer')).toBe(false);
  });
});
