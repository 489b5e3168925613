import { explainRows } from './plan-explain-dialog';

describe('explainRows', () => {
  it('labels known quantities in the order of the computation, then the rest; money from minor units', () => {
    const rows = explainRows(
      {
        feeMinor: { value: 19400, unit: 'eur minor units', why: 'Node-hours times the rate.', source: 'rate card', tag: 'choice' },
        somethingNew: { value: 0.5, unit: '1', why: 'A later addition.', source: 'Spincycle', tag: 'choice' },
        periodDays: { value: 10.23456, unit: 'd', why: 'Expected period.', source: 'Barnes (2007), ApJ 669, 1167, eqs. 1–3', tag: 'paper' },
        baselineForPrecisionDays: { value: null, unit: 'd', why: 'No precision asked.', source: 'Spincycle', tag: 'choice' },
      },
      'en-US',
      'eur',
    );
    expect(rows.map((r) => r.label)).toEqual(['Expected rotation period', 'Baseline for the period precision', 'Fee', 'Something new']);
    expect(rows[0]).toEqual(
      expect.objectContaining({ value: '10.23', unit: 'd', tagLabel: 'Published relation', methodsAnchor: 'gyrochronology' }),
    );
    expect(rows[1].value).toBe('—');
    expect(rows[2]).toEqual(expect.objectContaining({ value: '€194.00', unit: '' }));
    expect(rows[3]).toEqual(expect.objectContaining({ unit: '', tagLabel: 'Spincycle assumption', methodsAnchor: null }));
    // No developer wording: provenance words, not tags.
    for (const r of rows) expect(r.tagLabel).not.toMatch(/from memory|our choice|from the paper/);
  });

  it('completeness asked for and delivered read as percentages; counts in full', () => {
    const rows = explainRows(
      {
        visits: { value: 37268, unit: '1', why: 'Visits.', source: 'Spincycle', tag: 'derived' },
        requestedCompleteness: { value: 0.9, unit: '1', why: 'Asked for.', source: "the proposal's setting", tag: 'choice' },
        completeness: { value: 0.9040003, unit: '1', why: 'Delivered.', source: 'Marcum', tag: 'derived' },
        visitsForCompleteness99: { value: 294, unit: '1', why: 'At 99 %.', source: 'Spincycle', tag: 'derived' },
      },
      'en-US',
      'eur',
    );
    expect(rows.map((r) => [r.label, r.value, r.unit])).toEqual([
      ['Completeness asked for', '90 %', ''],
      ['Completeness delivered', '90 %', ''],
      ['Visits for 99 % completeness', '294', ''],
      ['Visits', '37,268', ''],
    ]);
  });

  it('a blocking "no expected period" flag: the period reads as such, with the reason', () => {
    const rows = explainRows(
      { periodDays: { value: 74.4, unit: 'd', why: 'Relation.', source: 'Angus et al. (2019)', tag: 'paper' } },
      'en-US',
      'eur',
      [
        {
          code: 'noExpectedPeriod',
          severity: 'blocking',
          message: 'no expected period: no expected period: the given age 14000 Myr exceeds the age of the universe, 13787 Myr',
        },
      ],
    );
    expect(rows[0]).toEqual(
      expect.objectContaining({
        value: 'No expected period',
        unit: '',
        why: 'No expected period: the given age 14000 Myr exceeds the age of the universe, 13787 Myr.',
      }),
    );
  });
});

describe('PlanExplainDialog', () => {
  it('loads every number of the plan when it opens, and says so when that fails', async () => {
    const { TestBed } = await import('@angular/core/testing');
    const { provideHttpClient } = await import('@angular/common/http');
    const { HttpTestingController, provideHttpClientTesting } = await import('@angular/common/http/testing');
    const { MAT_DIALOG_DATA } = await import('@angular/material/dialog');
    const { PlanExplainDialog } = await import('./plan-explain-dialog');
    const { testPlanRow } = await import('../../testing/fixtures');
    const { provideRouter } = await import('@angular/router');
    TestBed.configureTestingModule({
      imports: [PlanExplainDialog],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: { proposalId: 5, row: testPlanRow(3, 1) } },
      ],
    });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(PlanExplainDialog);
    TestBed.tick();
    const req = backend.expectOne((r) => r.url === '/api/proposals/5/targets/3/plan' && r.params.get('nodeId') === '1');
    expect((fixture.nativeElement as HTMLElement).querySelector('mat-progress-bar')).not.toBeNull();
    req.flush({
      targetId: 3,
      targetName: 'Lantern 3',
      nodeId: 1,
      nodeCode: 'KRG-50',
      currency: 'eur',
      relationLabel: 'Barnes (2007)',
      flags: [],
      quantities: {
        periodDays: { value: 10.2, unit: 'd', why: 'Expected period.', source: 'Barnes (2007), ApJ 669, 1167, eqs. 1–3', tag: 'paper' },
      },
    });
    await fixture.whenStable();
    const text = (fixture.nativeElement as HTMLElement).querySelector('[data-testid=quantities]')!.textContent!;
    expect(text).toContain('Expected rotation period');
    expect(text).toContain('Barnes (2007), ApJ 669, 1167');
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid=quantities] .methods-link')?.getAttribute('href')).toBe(
      '/methods#gyrochronology',
    );
    backend.verify();

    TestBed.resetTestingModule();
    TestBed.configureTestingModule({
      imports: [PlanExplainDialog],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: { proposalId: 5, row: testPlanRow(4, 1) } },
      ],
    });
    const backend2 = TestBed.inject(HttpTestingController);
    const failing = TestBed.createComponent(PlanExplainDialog);
    TestBed.tick();
    backend2
      .expectOne((r) => r.url === '/api/proposals/5/targets/4/plan')
      .flush({ code: 'plan_not_found', message: 'No computed plan' }, { status: 404, statusText: 'Not Found' });
    await failing.whenStable();
    expect((failing.nativeElement as HTMLElement).querySelector('[role=alert]')?.textContent).toMatch(
      /could not be loaded.*No computed plan/,
    );
  });
});
