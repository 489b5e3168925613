import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { RECOMPUTE_DEBOUNCE_MS } from '../planner-form';
import { PlannerStore } from '../planner-store';
import { TEST_CYCLE, testNode } from '../planner-test-data';
import { PlannerInputs } from './planner-inputs';

describe('PlannerInputs', () => {
  let fixture: ComponentFixture<PlannerInputs>;
  let backend: HttpTestingController;
  let store: PlannerStore;
  const host = () => fixture.nativeElement as HTMLElement;
  const q = <T extends Element = HTMLElement>(selector: string) => host().querySelector(selector) as T | null;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [PlannerStore, provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    store = TestBed.inject(PlannerStore);
    fixture = TestBed.createComponent(PlannerInputs);
    TestBed.tick();
    backend.expectOne('/api/nodes').flush([testNode(1, 'N1'), testNode(2, 'N2')]);
    backend.expectOne('/api/cycles').flush([TEST_CYCLE]);
    await settle();
  });

  afterEach(() => backend.verify());

  async function settle(): Promise<void> {
    await fixture.whenStable();
    await new Promise((resolve) => setTimeout(resolve, RECOMPUTE_DEBOUNCE_MS + 40));
    await fixture.whenStable();
  }

  async function type(testId: string, value: string): Promise<void> {
    const input = q<HTMLInputElement>(`[data-testid=${testId}]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
  }

  it('the colour system sits beside the colour, and the unit names the system', () => {
    const row = q('.colour-row')!;
    expect(row.querySelector('[data-testid=colour-system]')).not.toBeNull();
    expect(row.querySelector('[data-testid=colour-input]')).not.toBeNull();
    expect(row.querySelector('mat-label')?.textContent).toContain('BP−RP colour');
    expect(row.textContent).toContain('between 0.56 and 3.35 mag');
    expect(q('[data-testid=colour-warning]')).toBeNull();
  });

  it('several bad fields: each marked red with its own message at the same time', async () => {
    await type('colour-input', '5');
    await type('age-input', '-5');
    await type('magnitude-input', '30');
    await type('completeness-input', '30');
    await type('fap-input', '0.9');
    await type('reddening-input', '-1');
    await settle();
    const expected: Record<string, string> = {
      'colour-error': 'Enter a BP−RP colour between 0.56 and 3.35 mag (you typed 5).',
      'age-error': 'Enter an age above 0 Myr (you typed -5).',
      'magnitude-error': 'Enter a magnitude between −2 and 25 mag (you typed 30).',
      'completeness-error': 'Enter a completeness between 50 and 99 % (you typed 30).',
      'fap-error': 'Enter a false-alarm probability between 0 and 0.5, both excluded (you typed 0.9).',
      'reddening-error': 'Enter an E(B−V) between 0 and 3 mag, or leave it empty (you typed -1).',
    };
    for (const [testId, message] of Object.entries(expected)) expect(q(`[data-testid=${testId}]`)?.textContent?.trim()).toBe(message);
    for (const id of ['colour-input', 'age-input', 'magnitude-input', 'completeness-input', 'fap-input', 'reddening-input']) {
      expect(q(`[data-testid=${id}]`)?.getAttribute('aria-invalid')).toBe('true');
    }
  });

  it('a B−V that reads as a BP−RP: a warning beside the colour system', async () => {
    store.form.controls.colourSystem.setValue('BV');
    await settle();
    await type('colour-input', '2.5');
    await settle();
    expect(q('[data-testid=colour-warning]')?.textContent).toContain(
      'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
    );
    expect(q('.colour-row mat-label')?.textContent).toContain('B−V colour');
  });

  it('a fixed exposure shows the node’s range in the planner’s notation', async () => {
    store.form.controls.exposureMode.setValue('fixed');
    await fixture.whenStable();
    expect(q('[data-testid=exposure-input]')).not.toBeNull();
    expect(host().textContent).toContain('between 2 and 300 s on N1');
  });
});
