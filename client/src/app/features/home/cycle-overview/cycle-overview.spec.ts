import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Clock } from '../../../core/time/clock';
import { CycleListing } from '../cycle-api';
import { CycleOverview } from './cycle-overview';

const NOW = Date.parse('2026-03-01T12:00:00Z');

function cycle(id: number, status: CycleListing['status'], overrides: Partial<CycleListing> = {}): CycleListing {
  return {
    id,
    code: `C${id}`,
    title: `Cycle ${id}`,
    callOpensAt: '2026-02-01T12:00:00Z',
    callClosesAt: '2026-03-13T17:00:00Z',
    campaignStart: '2026-05-01',
    campaignEnd: '2026-10-31',
    anonymousReview: false,
    categories: [],
    version: 1,
    status,
    ...overrides,
  };
}

describe('CycleOverview', () => {
  let fixture: ComponentFixture<CycleOverview>;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [CycleOverview],
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: Clock, useValue: { now: signal(NOW) } }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CycleOverview);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';
  const all = (selector: string) => Array.from((fixture.nativeElement as HTMLElement).querySelectorAll(selector));

  it('while loading: shows a progress bar', () => {
    expect(all('mat-progress-bar')).toHaveLength(1);
    backend.expectOne('/api/cycles').flush([]);
  });

  it('open cycle: countdown in days, closing time in UTC, and the closed cycle left out', async () => {
    backend
      .expectOne('/api/cycles')
      .flush([cycle(1, 'open', { title: 'Spring call', anonymousReview: true }), cycle(2, 'closed', { title: 'Old call' })]);
    await fixture.whenStable();
    const cards = all('[data-testid=cycle-open]');
    expect(cards).toHaveLength(1);
    expect(cards[0].textContent).toContain('Spring call');
    expect(cards[0].textContent).toContain('Call closes in 12 days');
    expect(cards[0].querySelector('[data-testid=closes-utc]')?.textContent).toBe('13 Mar 2026, 17:00 UTC');
    expect(cards[0].textContent).toContain('Anonymous review');
    expect(text()).not.toContain('Old call');
    expect(text()).not.toContain('No cycle is open at the moment.');
    expect(all('mat-progress-bar')).toHaveLength(0);
  });

  it('only an upcoming cycle: says no cycle is open, and counts down to its opening', async () => {
    backend
      .expectOne('/api/cycles')
      .flush([cycle(3, 'upcoming', { title: 'Autumn call', callOpensAt: '2026-03-04T12:00:00Z', callClosesAt: '2026-04-20T12:00:00Z' })]);
    await fixture.whenStable();
    expect(text()).toContain('No cycle is open at the moment.');
    const cards = all('[data-testid=cycle-upcoming]');
    expect(cards).toHaveLength(1);
    expect(cards[0].textContent).toContain('Call opens in 3 days');
  });

  it('no cycles at all: shows the empty message and no cards', async () => {
    backend.expectOne('/api/cycles').flush([]);
    await fixture.whenStable();
    expect(text()).toContain('No cycle is open at the moment.');
    expect(all('mat-card')).toHaveLength(0);
  });

  it('server error: shows the error with its message and a retry that asks again', async () => {
    backend
      .expectOne('/api/cycles')
      .flush({ code: 'server_error', message: 'Database unavailable.' }, { status: 500, statusText: 'Server Error' });
    await fixture.whenStable();
    expect(text()).toContain('The cycles could not be loaded. Database unavailable.');
    expect(text()).not.toContain('No cycle is open at the moment.');

    const retry = all('button').find((button) => button.textContent?.includes('Try again')) as HTMLButtonElement;
    retry.click();
    TestBed.tick();
    backend.expectOne('/api/cycles').flush([cycle(1, 'open')]);
    await fixture.whenStable();
    expect(all('[data-testid=cycle-open]')).toHaveLength(1);
  });
});
