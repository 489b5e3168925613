import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { computeTargetPlan } from '@spincycle/shared/science/target-plan';
import { RECOMPUTE_DEBOUNCE_MS } from './planner-form';
import { describeErrors, PlannerStore } from './planner-store';
import { TEST_CYCLE, TEST_SITE, testNode } from './planner-test-data';

const N1 = testNode(1, 'N1');
const N2 = testNode(2, 'N2', { apertureM: 1.0, band: 'R' });

describe('PlannerStore', () => {
  let store: PlannerStore;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [PlannerStore, provideHttpClient(), provideHttpClientTesting()] });
    store = TestBed.inject(PlannerStore);
    backend = TestBed.inject(HttpTestingController);
    TestBed.tick();
    backend.expectOne('/api/nodes').flush([N2, N1]);
    backend.expectOne('/api/cycles').flush([TEST_CYCLE]);
    await settle();
  });

  afterEach(() => backend.verify());

  async function settle(): Promise<void> {
    TestBed.tick();
    await new Promise((resolve) => setTimeout(resolve, RECOMPUTE_DEBOUNCE_MS + 40));
    TestBed.tick();
  }

  it('chooses the first node by code and the open cycle, and computes the default plan with its summary', () => {
    expect(store.activeNodes().map((n) => n.code)).toEqual(['N1', 'N2']);
    expect(store.form.controls.nodeId.value).toBe(1);
    expect(store.form.controls.cycleId.value).toBe(7);
    const state = store.planState();
    expect(state.kind).toBe('ok');
    const expected = computeTargetPlan(
      {
        name: 'Star A-17',
        colour: { value: 1.1, system: 'BPRP' },
        ageMyr: 800,
        ageUncertaintyMyr: 100,
        magnitude: { value: 11.5, band: 'G' },
      },
      N1,
      TEST_SITE,
      { falseAlarmProbability: 0.01, completeness: 0.9 },
    );
    expect(store.plan()?.quantities.visits.value).toBe(expected.quantities.visits.value);
    const summary = store.summary()!;
    expect(summary.title).toBe(expected.feasible ? 'Feasible on N1' : 'Not feasible on N1');
    expect(summary.figures.map((f) => f.key)).toContain('fee');
    expect(summary.sky).toBe('Sky window not checked yet: give the position and a cycle under Sky window.');
    expect(store.notices().every((flag) => flag.severity !== 'blocking')).toBe(true);
    expect(store.gyrochrone()).not.toBeNull();
    expect(store.periodColour()).not.toBeNull();
  });

  it('several bad fields: all of them in fieldErrors at once, the summary lists them, no plan', async () => {
    store.form.patchValue({ colourValue: 5, ageMyr: -5, magnitude: 30, ra: '25h', dec: '95.2' });
    await settle();
    const errors = store.fieldErrors();
    expect(Object.keys(errors).sort()).toEqual(['ageMyr', 'colourValue', 'dec', 'magnitude', 'ra']);
    expect(store.plan()).toBeNull();
    expect(store.summary()).toMatchObject({
      tone: 'invalid',
      lead: 'Fix the 5 fields marked in red: Colour, Age, Magnitude, Right ascension, Declination.',
    });
    backend.expectNone('/api/sky-windows');
  });

  it('the colour system: switching converts the colour, and a value of the other system warns', async () => {
    store.form.controls.colourSystem.setValue('BV');
    await settle();
    expect(store.form.controls.colourValue.value).toBeCloseTo(0.884, 2);
    expect(store.colourName()).toBe('B−V');
    store.form.controls.colourValue.setValue(2.5);
    await settle();
    expect(store.colourWarning()).toContain('but a plausible BP−RP: check the colour system');
    expect(store.fieldErrors().colourValue).toBe('Enter a B−V colour between 0.4 and 1.83 mag (you typed 2.5).');
  });

  it('the star-type helper fills the colour, reddened by the typed E(B−V)', async () => {
    store.form.controls.reddeningEbv.setValue(0.1);
    store.starType.setValue('G2V');
    await settle();
    expect(store.form.controls.colourValue.value).toBeGreaterThan(0.8);
    expect(store.nearestType()).toContain('G2V');
  });

  it('RA/Dec and a cycle: asks for the sky windows of the plan’s node and the compared ones; retry asks again', async () => {
    store.form.patchValue({ ra: '6h45m', dec: '-16.7' });
    store.toggleCompare(2, true);
    await settle();
    expect(store.isCompared(2)).toBe(true);
    const request = backend.expectOne('/api/sky-windows');
    expect(request.request.body).toEqual({ cycleId: 7, nodeIds: [1, 2], targets: [{ ra: '6h45m', dec: '-16.7' }], includeNights: true });
    expect(store.sky().kind).toBe('loading');
    request.flush({ code: 'unavailable', message: 'Try later.' }, { status: 503, statusText: 'Unavailable' });
    TestBed.tick();
    expect(store.skyError()).toBe('The sky window could not be computed. Try later.');
    expect(store.summary()?.sky).toBe('The sky window could not be computed.');
    store.retrySky();
    TestBed.tick();
    backend.expectOne('/api/sky-windows').flush({ code: 'unavailable', message: 'Try later.' }, { status: 503, statusText: 'Unavailable' });
  });

  it('describeErrors: one field by its message, several by their labels in page order', () => {
    expect(describeErrors({ ageMyr: 'Enter the age.' })).toBe('Age: Enter the age.');
    expect(describeErrors({ magnitude: 'x', colourValue: 'y' })).toBe('Fix the 2 fields marked in red: Colour, Magnitude.');
  });
});
