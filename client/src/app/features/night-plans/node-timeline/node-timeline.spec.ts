import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { programColours } from '../night-plan-format';
import { testNode, testOverview, testTimeline } from '../testing/night-plan-fixtures';
import { NodeTimeline } from './node-timeline';

const MARCH = '/api/night-plans/cycles/7/nodes/3/timeline?from=2027-03-01&to=2027-03-31';

describe('NodeTimeline', () => {
  let fixture: ComponentFixture<NodeTimeline>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  async function render(): Promise<void> {
    TestBed.configureTestingModule({
      imports: [NodeTimeline],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NodeTimeline);
    fixture.componentRef.setInput('cycleId', 7);
    fixture.componentRef.setInput('node', testNode());
    fixture.componentRef.setInput('campaignStart', '2027-03-01');
    fixture.componentRef.setInput('campaignEnd', '2027-04-15');
    fixture.componentRef.setInput('colours', programColours(testOverview().programs));
    fixture.componentRef.setInput('today', '2026-12-03');
    TestBed.tick();
  }
  afterEach(() => backend.verify());

  it('asks for the first month of the campaign and draws each night with its visits, Moon and lost night', async () => {
    await render();
    backend.expectOne(MARCH).flush(testTimeline());
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=timeline-month]')?.textContent).toContain('March 2027');

    const nights = [...el().querySelectorAll('button.night')] as HTMLButtonElement[];
    expect(nights.map((b) => b.dataset['testid'])).toEqual(['night-2027-03-01', 'night-2027-03-02', 'night-2027-03-03']);
    // Site time is UTC−3 (fixtures): the done visit at 02:00–03:00 UTC reads 23:00–00:00.
    expect(nights[0].getAttribute('aria-label')).toBe('1 Mon: 1 Mar 2027, 2 visits (1 done, 1 missed), dark 20:00–06:00, Moon 10 % lit');
    expect(nights[1].getAttribute('aria-label')).toContain('Lost 2 Tue: 2 Mar 2027, lost: Cloud over the ridge');
    expect(nights[1].classList).toContain('lost');
    expect(nights[1].querySelector('[data-testid=lost-label]')?.textContent).toBe('Lost');
    expect(nights[0].querySelector('[data-testid=lost-label]')).toBeNull();

    const done = el().querySelector('[data-testid=visit-101]') as HTMLElement;
    const missed = el().querySelector('[data-testid=visit-102]') as HTMLElement;
    const planned = el().querySelector('[data-testid=visit-103]') as HTMLElement;
    expect([done.dataset['status'], missed.dataset['status'], planned.dataset['status']]).toEqual(['done', 'missed', 'planned']);
    // Program 21 is the first of the overview (blue), 22 the second (orange): Okabe & Ito.
    expect(done.style.getPropertyValue('--c')).toBe('#0072B2');
    expect(missed.style.getPropertyValue('--c')).toBe('#E69F00');
    // The axis runs from 20:00 (dusk, 8 h after noon) to 06:00 (18 h): 10 h; 02:00 UTC = 23:00 = 30 % down, 1 h = 10 %.
    expect(parseFloat(done.style.top)).toBeCloseTo(30, 5);
    expect(parseFloat(done.style.height)).toBeCloseTo(10, 5);
    // The Moon tints the night in proportion to its light.
    const moon = [...el().querySelectorAll('[data-testid=moonlight]')] as HTMLElement[];
    expect(moon.map((m) => Number(m.style.opacity))).toEqual([0.1 * 0.45, 0.45 * 0.45, 0.8 * 0.45].map((x) => Number(String(x))));
  });

  it('a night is a button that names its date when chosen; the arrow keys move between nights', async () => {
    await render();
    backend.expectOne(MARCH).flush(testTimeline());
    await fixture.whenStable();
    const chosen: string[] = [];
    fixture.componentInstance.nightChosen.subscribe((d) => chosen.push(d));
    (el().querySelector('[data-testid=night-2027-03-03]') as HTMLButtonElement).click();
    expect(chosen).toEqual(['2027-03-03']);
    // The arrow keys move between the nights.
    const first = el().querySelector('[data-testid=night-2027-03-01]') as HTMLButtonElement;
    first.focus();
    first.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    expect(document.activeElement?.getAttribute('data-testid')).toBe('night-2027-03-02');
    document.activeElement!.dispatchEvent(new KeyboardEvent('keydown', { key: 'End', bubbles: true }));
    expect(document.activeElement?.getAttribute('data-testid')).toBe('night-2027-03-03');
  });

  it('the table toggle shows the same nights in words', async () => {
    await render();
    backend.expectOne(MARCH).flush(testTimeline());
    await fixture.whenStable();
    const toggle = el().querySelector('[data-testid=timeline-table-toggle]') as HTMLButtonElement;
    expect(toggle.getAttribute('aria-expanded')).toBe('false');
    expect(el().querySelector('[data-testid=timeline-table]')).toBeNull();
    toggle.click();
    await fixture.whenStable();
    expect(toggle.getAttribute('aria-expanded')).toBe('true');
    const row1 = el().querySelector('[data-testid=row-2027-03-01]')!.textContent!.replace(/\s+/g, ' ');
    expect(row1).toContain('23:00–00:00 Quill-1 (Spots on slow rotators): Done');
    expect(row1).toContain('01:00–01:30 Ember-4 (Flares in the young group): Missed');
    expect(el().querySelector('[data-testid=row-2027-03-02]')!.textContent).toContain('Cloud over the ridge');
  });

  it('next month asks for April up to the end of the campaign; previous is disabled on the first month', async () => {
    await render();
    backend.expectOne(MARCH).flush(testTimeline());
    await fixture.whenStable();
    expect((el().querySelector('[data-testid=previous-month]') as HTMLButtonElement).disabled).toBe(true);
    (el().querySelector('[data-testid=next-month]') as HTMLButtonElement).click();
    TestBed.tick();
    backend.expectOne('/api/night-plans/cycles/7/nodes/3/timeline?from=2027-04-01&to=2027-04-15').flush({ node: testNode(), nights: [] });
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=timeline-month]')?.textContent).toContain('April 2027');
    expect((el().querySelector('[data-testid=next-month]') as HTMLButtonElement).disabled).toBe(true);
    expect(el().textContent).toContain('No night of the campaign falls in this month.');
  });

  it('error: the message', async () => {
    await render();
    backend.expectOne(MARCH).flush({ code: 'x', message: 'Not built yet' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain('The nights of this node could not be loaded. Not built yet');
  });
});
