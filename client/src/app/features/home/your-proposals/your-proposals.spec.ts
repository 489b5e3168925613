import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { Clock } from '../../../core/time/clock';
import { testSummary } from '../../proposals/testing/fixtures';
import { YourProposals } from './your-proposals';

const NOW = Date.parse('2027-01-03T12:00:00Z');

describe('YourProposals', () => {
  let fixture: ComponentFixture<YourProposals>;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [YourProposals],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), { provide: Clock, useValue: { now: signal(NOW) } }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(YourProposals);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  it('open drafts first, by deadline, with their countdown; then the others by last update; at most five', async () => {
    backend
      .expectOne('/api/proposals')
      .flush([
        testSummary(1, { title: 'Reviewed one', state: 'in_review', updatedAt: '2026-12-20T09:00:00Z' }),
        testSummary(2, { title: 'Later draft', callClosesAt: '2027-02-01T12:00:00Z' }),
        testSummary(3, { title: 'Sooner draft', callClosesAt: '2027-01-15T12:00:00Z' }),
        testSummary(4, { title: 'Older award', state: 'awarded', updatedAt: '2026-06-01T09:00:00Z' }),
        testSummary(5, { title: 'Recent submission', state: 'submitted', updatedAt: '2026-12-30T09:00:00Z' }),
        testSummary(6, { title: 'Oldest', state: 'not_awarded', updatedAt: '2025-06-01T09:00:00Z' }),
      ]);
    await fixture.whenStable();
    const items = Array.from(fixture.nativeElement.querySelectorAll('[data-testid=home-proposals] li')) as HTMLElement[];
    expect(items.map((li) => li.querySelector('.title')?.textContent)).toEqual([
      'Sooner draft',
      'Later draft',
      'Recent submission',
      'Reviewed one',
      'Older award',
    ]);
    expect(items[0].textContent).toContain('Call closes in 12 days');
    expect(items[2].querySelector('[data-testid=state-chip]')?.textContent).toBe('Submitted');
    expect(fixture.nativeElement.textContent).toContain('All 6 proposals');
  });

  it('none yet: the empty message and the way to the proposals page', async () => {
    backend.expectOne('/api/proposals').flush([]);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('You have no proposal yet.');
    expect(fixture.nativeElement.querySelector('a[href="/proposals"]')).not.toBeNull();
  });
});
