import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { ActivatedRouteSnapshot, provideRouter, Router, RouterStateSnapshot, UrlTree } from '@angular/router';
import { seedSession, testUser } from '../../../testing/session';
import { authGuard } from './auth-guard';

function runGuard(url: string) {
  return TestBed.runInInjectionContext(() => authGuard({} as ActivatedRouteSnapshot, { url } as RouterStateSnapshot));
}

describe('authGuard', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
  });

  afterEach(() => TestBed.inject(HttpTestingController).verify());

  it('signed in: lets the navigation through', async () => {
    await seedSession(testUser(['proposer']));
    expect(runGuard('/network')).toBe(true);
  });

  it('signed out: redirects to /sign-in with the wanted URL as returnUrl', async () => {
    await seedSession(null);
    const result = runGuard('/network?sort=code');
    expect(result).toBeInstanceOf(UrlTree);
    const router = TestBed.inject(Router);
    expect(router.serializeUrl(result as UrlTree)).toBe('/sign-in?returnUrl=%2Fnetwork%3Fsort%3Dcode');
  });
});
