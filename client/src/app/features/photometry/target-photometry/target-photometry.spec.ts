import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { TargetPhotometry as TargetPhotometryBody } from '@spincycle/shared/photometry/photometry';
import { ProposalStore } from '../../proposals/proposal-store';
import {
  testAliasMeasurement,
  testAliasRow,
  testMeasurement,
  testNotDetectedRow,
  testRow,
  testTargetPhotometry,
} from '../testing/photometry-fixtures';
import TargetPhotometry from './target-photometry';

describe('TargetPhotometry', () => {
  let fixture: ComponentFixture<TargetPhotometry>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;

  async function open(targetId: string, answer: TargetPhotometryBody | { status: number; body: object }) {
    TestBed.configureTestingModule({
      imports: [TargetPhotometry],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: ProposalStore, useValue: { id: signal(5) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TargetPhotometry);
    fixture.componentRef.setInput('targetId', targetId);
    TestBed.tick();
    const req = backend.expectOne(`/api/proposals/5/photometry/targets/${targetId}`);
    if ('status' in answer) req.flush(answer.body, { status: answer.status, statusText: 'Error' });
    else req.flush(answer);
    await fixture.whenStable();
  }
  afterEach(() => backend.verify());

  it('a measured target: the headline, the verdict with its rule and reasons, and the four charts with text alternatives', async () => {
    await open('14', testTargetPhotometry());
    expect(text('[data-testid=target-photometry-name]')).toBe('Lantern-14');
    expect(text('[data-testid=target-period]')).toBe('8.214 ± 0.034 d');
    expect(text('[data-testid=target-fap]')).toBe('3×10⁻⁵');
    expect(text('[data-testid=target-amplitude]')).toBe('4.2 mmag');
    expect(text('[data-testid=target-age]')).toBe('612 Myr (480–750)');
    expect(text('[data-testid=target-expected]')).toBe(
      'Expected: 8.6 days, plausibly 6.9 to 10.4 days (the target plan on node KRG-50). The measured period lies in this range.',
    );
    expect(text('[data-testid=target-verdict]')).toContain('Measured: false-alarm probability below 10⁻³');
    expect(text('[data-testid=target-verdict]')).toContain('At least 3 cycles covered: yes (4.8).');
    expect(el().querySelector('[data-testid=target-alias-warning]')).toBeNull();
    for (const id of ['light-curve-chart', 'periodogram-chart', 'folded-chart', 'window-chart']) {
      const figure = el().querySelector(`[data-testid=${id}]`)!;
      expect(figure).not.toBeNull();
      expect(figure.querySelector('canvas')!.getAttribute('role')).toBe('img');
      expect(figure.querySelector('canvas')!.getAttribute('aria-label')!.length).toBeGreaterThan(20);
    }
    expect(el().querySelector('[data-testid=periodogram-chart] canvas')!.getAttribute('aria-label')).toContain('Best peak at 8.214 days');
    // The strongest peaks as a table for screen readers.
    expect(el().querySelectorAll('[data-testid=periodogram-peaks] tbody tr')).toHaveLength(2);
    expect(text('[data-testid=target-detrend-steps]')).toContain('Clipped 3 points beyond 5σ.');
    expect(text('[data-testid=target-search-band]')).toContain('Periods searched: 0.5 to 50 days (200 frequencies).');
    expect(text('[data-testid=target-uploads]')).toContain('lantern-14-krg.csv');
    expect(text('[data-testid=target-uploads]')).toContain('Orla Venn');
  });

  it('an alias-flagged target: the warning with its message and candidates, the age’s cautions', async () => {
    await open('31', testTargetPhotometry({ row: testAliasRow(), measurement: testAliasMeasurement() }));
    expect(text('[data-testid=target-alias-warning]')).toContain('The period may be an alias');
    expect(text('[data-testid=target-alias-warning]')).toContain('A peak at 7.73 d, one sidereal day away, is nearly as strong');
    const cells = Array.from(el().querySelectorAll('[data-testid=alias-candidates] tbody td')).map((td) => td.textContent!.trim());
    expect(cells).toEqual(['7.73', 'f − 1.003 d⁻¹', '92 %', '2×10⁻⁹']);
    expect(text('[data-testid=target-expected]')).toContain('The measured period lies outside this range.');
    expect(text('[data-testid=target-age-cautions] li > span')).toBe('Caution: Fast rotator: the age is a lower limit.');
    expect(el().querySelector('[data-testid=verdict-chip]')!.textContent).toContain('Tentative');
  });

  it('a possibly double period: the warning with its message and rule (and none when not flagged)', async () => {
    const message = 'The rotation period may be 16.428 d, twice the best period.';
    const doublePeriod = { flagged: true, doublePeriodDays: 16.428, likelihoodRatio: 41.2, message, rule: 'Twice the best one when …' };
    await open('14', testTargetPhotometry({ measurement: testMeasurement({ doublePeriod }) }));
    expect(text('[data-testid=target-double-period]')).toContain('The rotation period may be twice this');
    expect(text('[data-testid=target-double-period]')).toContain(message);
  });

  it('a not-detected target without a best period: no folded chart, the verdict says why', async () => {
    const m = testMeasurement();
    await open(
      '22',
      testTargetPhotometry({
        row: testNotDetectedRow(),
        measurement: { ...m, best: null, verdict: 'not_detected', verdictReasons: ['No peak has a false-alarm probability below 10⁻³.'] },
      }),
    );
    expect(text('[data-testid=target-period]')).toBe('—');
    expect(el().querySelector('[data-testid=folded-chart]')).toBeNull();
    expect(el().querySelector('[data-testid=periodogram-chart]')).not.toBeNull();
    expect(text('[data-testid=target-verdict]')).toContain('No peak has a false-alarm probability below 10⁻³.');
  });

  it('not analysed yet / nothing uploaded: says which', async () => {
    await open('14', testTargetPhotometry({ measurement: null, row: testRow(14, { analysedAt: null, verdict: null }) }));
    expect(text('[data-testid=target-not-analysed]')).toContain('has not been analysed yet');
    expect(text('[data-testid=verdict-chip]')).toContain('Not analysed');
  });

  it('404: the target is not in the program', async () => {
    await open('99', { status: 404, body: { code: 'target_not_found', message: 'No target 99' } });
    expect(text('[role=alert]')).toContain('This target is not in the program, or you are not on its team.');
  });

  it('409: the empty state of a proposal without a program', async () => {
    await open('14', { status: 409, body: { code: 'no_program', message: 'No program yet' } });
    expect(el().textContent).toContain('Light curves can be uploaded once the proposal is awarded and its program starts.');
    expect(el().querySelector('[role=alert]')).toBeNull();
  });
});
