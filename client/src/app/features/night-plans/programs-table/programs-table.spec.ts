import { ComponentFixture, TestBed } from '@angular/core/testing';
import { testCompleteProgram, testOverview, testProgram } from '../testing/night-plan-fixtures';
import { ProgramsTable } from './programs-table';

describe('ProgramsTable', () => {
  let fixture: ComponentFixture<ProgramsTable>;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)!.textContent!.replace(/\s+/g, ' ').trim();

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [ProgramsTable] });
    fixture = TestBed.createComponent(ProgramsTable);
    fixture.componentRef.setInput('programs', testOverview().programs);
    await fixture.whenStable();
  });

  it('shows each program’s visits, recovery and targets at risk', () => {
    expect(text('[data-testid=program-21] [data-testid=visits-done]')).toBe('6');
    expect(text('[data-testid=program-21] [data-testid=visits-planned]')).toBe('34');
    // 40 required − 34 planned = 6 not planned (worked by hand in this test).
    expect(text('[data-testid=program-21] [data-testid=visits-required]')).toBe('40 (6 not planned)');
    expect(text('[data-testid=program-21] [data-testid=recovery-value]')).toBe('81 %');
    expect(text('[data-testid=program-21] [data-testid=program-risks] li')).toContain(
      'Quill-1 (KRG-50): A gap of 9 nights is longer than the 8 nights the cadence allows.',
    );
    expect(text('[data-testid=program-22] [data-testid=program-risks]')).toBe('None');
  });

  it('shows each program’s state as a chip; an unfinished one says nothing about completion', () => {
    expect(text('[data-testid=program-21] [data-testid=program-state-chip]')).toBe('Observing');
    expect(text('[data-testid=program-21] th.program .muted')).toBe('Mara Quillfeather · Observing');
    expect(el().querySelector('[data-testid=program-21] [data-testid=program-completion]')).toBeNull();
  });

  it('a complete program: a Complete chip and why, by its visits or by the campaign’s end', async () => {
    fixture.componentRef.setInput('programs', [
      testCompleteProgram('visits'),
      testCompleteProgram('campaign', { proposalId: 23, title: 'Late spots' }),
      testProgram({ proposalId: 24, title: 'Quiet stars', programState: 'withdrawn' }),
      testCompleteProgram('visits', { proposalId: 25, title: 'Old record', completion: null }),
    ]);
    await fixture.whenStable();
    const chip = el().querySelector('[data-testid=program-21] [data-testid=program-state-chip]')!;
    expect(chip.textContent).toBe('Complete');
    expect(chip.classList).toContain('complete');
    expect(text('[data-testid=program-21] [data-testid=program-completion]')).toBe(
      'Complete because every target has the visit nights its plan needs.',
    );
    // The last night 2027-04-15 as the `day` pipe writes it (worked by hand in this test).
    expect(text('[data-testid=program-23] [data-testid=program-completion]')).toBe('Complete because the campaign ended on 15 Apr 2027.');
    expect(text('[data-testid=program-24] [data-testid=program-state-chip]')).toBe('Withdrawn');
    expect(el().querySelector('[data-testid=program-24] [data-testid=program-completion]')).toBeNull();
    expect(text('[data-testid=program-25] [data-testid=program-completion]')).toBe('Complete.');
  });

  it('the recovery fraction is explained on demand', async () => {
    const toggle = el().querySelector('[data-testid=recovery-meaning-toggle]') as HTMLButtonElement;
    const meaning = el().querySelector('[data-testid=recovery-meaning]') as HTMLElement;
    expect(meaning.hidden).toBe(true);
    toggle.click();
    await fixture.whenStable();
    expect(meaning.hidden).toBe(false);
    expect(toggle.getAttribute('aria-expanded')).toBe('true');
    expect(meaning.textContent).toContain('within 10 % of the true one');
  });

  it('a program opens to its targets with cadence asked and planned and each recovery’s explanation', async () => {
    const expand = el().querySelector('[data-testid=expand-21]') as HTMLButtonElement;
    expect(expand.getAttribute('aria-expanded')).toBe('false');
    expect(el().querySelector('[data-testid=targets-21]')).toBeNull();
    expand.click();
    await fixture.whenStable();
    expect(expand.getAttribute('aria-expanded')).toBe('true');
    const quill1 = text('[data-testid=target-21-501-3]');
    expect(quill1).toContain('4 / 18 / 20');
    expect(quill1).toContain('9 / 10');
    // Step 6, tolerance 2: 4 to 8 nights; the 9-night gap is past it and flagged.
    expect(quill1).toContain('every 6 nights (4 to 8)');
    expect(text('[data-testid=target-21-501-3] [data-testid=cadence]')).toContain('median 6 nights, largest gap 9 nights');
    expect(el().querySelector('[data-testid=target-21-501-3] [data-testid=cadence]')!.classList).toContain('late');
    expect(el().querySelector('[data-testid=target-21-502-3] [data-testid=cadence]')!.classList).not.toContain('late');
    expect(text('[data-testid=target-21-502-3] [data-testid=cadence]')).toBe('median 6 nights, largest gap 7 nights');
    (el().querySelector('[data-testid=why-21-501-3]') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(text('#why-21-501-3')).toContain('Recovered in 72 of 100 simulated light curves');
  });
});
