import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { NightPlanCycleSummary } from '@spincycle/shared/night-plans/night-plans';
import NightPlanCyclePicker from './night-plan-cycle-picker';

const CYCLES: NightPlanCycleSummary[] = [
  { id: 7, code: '2027A', title: 'Lantern season', programs: 5, releasedAt: '2027-02-10T12:00:00Z', lastBuildAt: '2027-02-20T09:00:09Z' },
  { id: 4, code: '2026B', title: 'Ember season', programs: 1, releasedAt: '2026-09-01T12:00:00Z', lastBuildAt: null },
];

describe('NightPlanCyclePicker', () => {
  let fixture: ComponentFixture<NightPlanCyclePicker>;
  let backend: HttpTestingController;

  function render(): void {
    TestBed.configureTestingModule({
      imports: [NightPlanCyclePicker],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NightPlanCyclePicker);
    TestBed.tick();
  }
  afterEach(() => backend.verify());
  const el = () => fixture.nativeElement as HTMLElement;

  it('lists the released cycles with their programs and last build, each a link to its night plans', async () => {
    render();
    backend.expectOne('/api/night-plans/cycles').flush(CYCLES);
    await fixture.whenStable();
    const links = [...el().querySelectorAll('[data-testid=night-plan-cycles] a')] as HTMLAnchorElement[];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/night-plans/7', '/night-plans/4']);
    expect(links[0].textContent).toContain('5 programs');
    expect(links[0].textContent).toContain('Night plans last built 20 Feb 2027, 09:00 UTC');
    expect(links[1].textContent).toContain('1 program');
    expect(links[1].textContent).toContain('No night plans built yet');
  });

  it('empty: no released cycle', async () => {
    render();
    backend.expectOne('/api/night-plans/cycles').flush([]);
    await fixture.whenStable();
    expect(el().textContent).toContain('No cycle has released its awards yet');
  });

  it('error: the message', async () => {
    render();
    backend
      .expectOne('/api/night-plans/cycles')
      .flush({ code: 'x', message: 'Database asleep' }, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain('The cycles could not be loaded.');
  });
});
