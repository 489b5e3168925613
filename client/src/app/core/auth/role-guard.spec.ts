import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { ActivatedRouteSnapshot, provideRouter, Router, RouterStateSnapshot, UrlTree } from '@angular/router';
import { seedSession, testUser } from '../../../testing/session';
import { roleGuard } from './role-guard';

function runGuard(url: string) {
  return TestBed.runInInjectionContext(() => roleGuard('administrator')({} as ActivatedRouteSnapshot, { url } as RouterStateSnapshot));
}

describe('roleGuard', () => {
  let snackOpen: jest.Mock;

  beforeEach(() => {
    snackOpen = jest.fn();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: snackOpen } },
      ],
    });
  });

  afterEach(() => TestBed.inject(HttpTestingController).verify());

  it('holder of the role: lets the navigation through without a message', async () => {
    await seedSession(testUser(['proposer', 'administrator']));
    expect(runGuard('/admin/accounts')).toBe(true);
    expect(snackOpen).not.toHaveBeenCalled();
  });

  it('lacking the role: redirects home and says which role the page needs', async () => {
    await seedSession(testUser(['proposer', 'reviewer']));
    const result = runGuard('/admin/accounts');
    expect(result).toBeInstanceOf(UrlTree);
    expect(TestBed.inject(Router).serializeUrl(result as UrlTree)).toBe('/');
    expect(snackOpen).toHaveBeenCalledWith('That page is for the administrator role.', 'Dismiss', expect.anything());
  });

  it('signed out: redirects to sign-in rather than home', async () => {
    await seedSession(null);
    const result = runGuard('/admin/accounts');
    expect(TestBed.inject(Router).serializeUrl(result as UrlTree)).toBe('/sign-in?returnUrl=%2Fadmin%2Faccounts');
    expect(snackOpen).not.toHaveBeenCalled();
  });
});
