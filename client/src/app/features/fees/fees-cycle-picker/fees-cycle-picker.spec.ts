import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import FeesCyclePicker from './fees-cycle-picker';

describe('FeesCyclePicker', () => {
  let fixture: ComponentFixture<FeesCyclePicker>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [FeesCyclePicker],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FeesCyclePicker);
    TestBed.tick();
    fixture.detectChanges();
  });

  afterEach(() => backend.verify());

  it('lists the released cycles, each a link to its fees with the release instant', async () => {
    expect(el().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Loading the cycles');
    backend.expectOne('/api/billing/cycles').flush([
      { id: 7, code: '2027A', title: 'Lantern season', awardsReleasedAt: '2027-03-01T12:00:00.000Z' },
      { id: 4, code: '2026B', title: 'Ember season', awardsReleasedAt: '2026-09-01T12:00:00.000Z' },
    ]);
    await fixture.whenStable();
    const links = [...el().querySelectorAll('[data-testid=fee-cycles] a')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/fees/manage/7', '/fees/manage/4']);
    expect(links[0].textContent).toContain('2027A · Lantern season');
    expect(links[0].textContent).toContain('Awards released 1 Mar 2027, 12:00 UTC');
  });

  it('empty: says when a cycle appears', async () => {
    backend.expectOne('/api/billing/cycles').flush([]);
    await fixture.whenStable();
    expect(el().textContent).toContain('a cycle appears here once its decisions are released to the teams');
  });

  it('error: the sentence as an alert', async () => {
    backend.expectOne('/api/billing/cycles').flush({ code: 'x', message: 'Database asleep.' }, { status: 500, statusText: 'Error' });
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain('The cycles could not be loaded. Database asleep.');
  });
});
