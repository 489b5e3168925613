import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { TeamDecision } from '@spincycle/shared/awards/awards';
import { testTeamDecision } from '../testing/award-fixtures';
import { DecisionCard } from './decision-card';

const URL = '/api/awards/proposals/5/decision';

describe('DecisionCard', () => {
  let fixture: ComponentFixture<DecisionCard>;
  let backend: HttpTestingController;

  async function render(answer: TeamDecision | { status: number; body: { code: string; message: string } }): Promise<HTMLElement> {
    TestBed.configureTestingModule({ imports: [DecisionCard], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DecisionCard);
    fixture.componentRef.setInput('proposalId', 5);
    TestBed.tick();
    const req = backend.expectOne(URL);
    if ('status' in answer) req.flush(answer.body, { status: answer.status, statusText: 'Refused' });
    else req.flush(answer);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }
  afterEach(() => backend.verify());

  const text = (el: HTMLElement, testId: string) =>
    (el.querySelector(`[data-testid=${testId}]`)?.textContent ?? '').replace(/\s+/g, ' ').trim();

  it('awarded: the outcome in words, node-hours per node, every target, the program state and the comments by reviewer number', async () => {
    const el = await render(testTeamDecision());
    expect(text(el, 'decision-headline')).toContain('Your proposal was awarded node-hours.');
    expect(text(el, 'decision-nodes')).toContain('KRG-50');
    expect(text(el, 'decision-nodes')).toContain('117.5 node-hours');
    expect(text(el, 'decision-targets')).toBe('Every target of the proposal is part of the award.');
    expect(text(el, 'decision-program')).toBe('Program: Scheduled: the facility is planning its nights.');
    const comments = Array.from(el.querySelectorAll('[data-testid=decision-comments] article'));
    expect(comments.map((c) => c.querySelector('h4')?.textContent)).toEqual(['Reviewer 1', 'Reviewer 2']);
    expect(comments[0].textContent).toContain('A clear cadence argument.');
    expect(comments[0].textContent).toContain('Few comparison stars.');
    expect(comments[1].textContent).toContain('No comment.');
  });

  it('a partial award names the targets kept', async () => {
    const el = await render(testTeamDecision({ awardedTargets: ['Star Alder 1', 'Star Alder 2'] }));
    expect(text(el, 'decision-targets')).toBe('Only 2 of your targets are part of the award: Star Alder 1, Star Alder 2.');
  });

  it('reserve: says what reserve means and gives the hours as if promoted', async () => {
    const el = await render(testTeamDecision({ outcome: 'reserve', programState: null }));
    expect(text(el, 'decision-headline')).toContain('Your proposal is on the reserve list.');
    expect(el.textContent).toContain('only if awarded time becomes free');
    expect(el.textContent).toContain('Node-hours if promoted');
    expect(el.querySelector('[data-testid=decision-program]')).toBeNull();
  });

  it('not awarded: no hours, no targets, the comments still shown', async () => {
    const el = await render(testTeamDecision({ outcome: 'not_awarded', nodes: [], programState: null }));
    expect(text(el, 'decision-headline')).toContain('Your proposal was not awarded node-hours in this cycle.');
    expect(el.querySelector('[data-testid=decision-nodes]')).toBeNull();
    expect(el.querySelector('[data-testid=decision-targets]')).toBeNull();
    expect(el.querySelectorAll('[data-testid=decision-comments] article')).toHaveLength(2);
  });

  it('404 (not released yet): shows nothing at all', async () => {
    const el = await render({ status: 404, body: { code: 'decision_not_found', message: 'No decision yet.' } });
    expect(el.querySelector('[data-testid=decision-card]')).toBeNull();
    expect(el.querySelector('[role=alert]')).toBeNull();
    expect(el.textContent?.trim()).toBe('');
  });

  it('another failure: a small error state with the message', async () => {
    const el = await render({ status: 503, body: { code: 'unavailable', message: 'Database asleep.' } });
    expect(el.querySelector('[data-testid=decision-card]')).toBeNull();
    expect(el.querySelector('[role=alert]')?.textContent).toContain('The decision on this proposal could not be loaded. Database asleep.');
  });
});
