import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { AwardCycleSummary } from '@spincycle/shared/awards/awards';
import AwardCyclePicker, { cycleProgress } from './award-cycle-picker';

const CYCLES: AwardCycleSummary[] = [
  { id: 7, code: '2027A', title: 'Lantern season', lockedPanels: 2, panels: 3, ranked: 8, decided: 5, releasedAt: null },
  { id: 4, code: '2026B', title: 'Ember season', lockedPanels: 1, panels: 1, ranked: 1, decided: 1, releasedAt: '2026-09-01T12:00:00Z' },
];

describe('AwardCyclePicker', () => {
  let fixture: ComponentFixture<AwardCyclePicker>;
  let backend: HttpTestingController;

  function render(): void {
    TestBed.configureTestingModule({
      imports: [AwardCyclePicker],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AwardCyclePicker);
    TestBed.tick();
  }
  afterEach(() => backend.verify());
  const el = () => fixture.nativeElement as HTMLElement;

  it('lists the cycles with their locked panels, decided proposals and release, each a link to its board', async () => {
    render();
    backend.expectOne('/api/awards/cycles').flush(CYCLES);
    await fixture.whenStable();
    const links = [...el().querySelectorAll('[data-testid=award-cycles] a')] as HTMLAnchorElement[];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/awards/7', '/awards/4']);
    const first = links[0].textContent!.replace(/\s+/g, ' ');
    expect(first).toContain('2027A · Lantern season');
    expect(first).toContain('2 of 3 panels locked; 5 of 8 ranked proposals decided');
    expect(first).toContain('Not released');
    expect(links[1].textContent).toContain('Decisions released 1 Sep 2026, 12:00 UTC');
  });

  it('empty: says when a cycle appears', async () => {
    render();
    backend.expectOne('/api/awards/cycles').flush([]);
    await fixture.whenStable();
    expect(el().textContent).toContain('No cycle is ready for awards yet');
  });

  it('error: the message', async () => {
    render();
    backend.expectOne('/api/awards/cycles').flush({ code: 'x', message: 'Database asleep' }, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain('The cycles could not be loaded.');
  });

  it('cycleProgress: singular words, and no ranked proposal yet', () => {
    expect(cycleProgress({ ...CYCLES[0], lockedPanels: 0, panels: 1, ranked: 0, decided: 0 })).toBe('0 of 1 panel locked; none ranked yet');
  });
});
