import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { CyclePicker, type CyclePickerCycle } from './cycle-picker';

const CYCLES: CyclePickerCycle[] = [
  { id: 7, code: '2027A', title: 'Lantern season', lines: [{ text: '5 programs' }, { text: 'Last built', at: '2027-02-20T09:00:09Z' }] },
  { id: 4, code: '2026B', title: 'Ember season', lines: [{ text: 'Not built yet', at: null }] },
];

@Component({
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CyclePicker],
  template: `
    <app-cycle-picker
      [cycles]="cycles()"
      [loading]="loading()"
      [error]="error()"
      emptyText="No cycle yet: one appears here once it is released."
      linkBase="/night-plans"
      testId="plan-cycles"
      [itemTestId]="itemTestId()"
      [selectedId]="selectedId()"
      (selected)="chosen.push($event)"
      (retry)="retries = retries + 1"
    />
  `,
})
class Host {
  readonly cycles = signal<CyclePickerCycle[] | undefined>(undefined);
  readonly loading = signal(false);
  readonly error = signal<string | null>(null);
  readonly itemTestId = signal<string | null>('plan-cycle-');
  readonly selectedId = signal<number | null>(null);
  readonly chosen: number[] = [];
  retries = 0;
}

/** Where the links lead in this test. */
@Component({ changeDetection: ChangeDetectionStrategy.OnPush, template: '' })
class Board {}

describe('CyclePicker', () => {
  let fixture: ComponentFixture<Host>;
  const el = () => fixture.nativeElement as HTMLElement;
  const host = () => fixture.componentInstance;
  const links = () => [...el().querySelectorAll('[data-testid=plan-cycles] a')] as HTMLAnchorElement[];

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [Host], providers: [provideRouter([{ path: 'night-plans/:id', component: Board }])] });
    fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
  });

  it('loading: a named progress bar, no list and no empty message', async () => {
    host().loading.set(true);
    await fixture.whenStable();
    expect(el().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Loading the cycles');
    expect(el().querySelector('mat-nav-list')).toBeNull();
    expect(el().textContent).not.toContain('No cycle yet');
  });

  it('empty: the page’s sentence once the list is loaded and has no cycle (not before)', async () => {
    expect(el().textContent).not.toContain('No cycle yet');
    host().cycles.set([]);
    await fixture.whenStable();
    expect(el().textContent).toContain('No cycle yet: one appears here once it is released.');
    expect(el().querySelector('mat-nav-list')).toBeNull();
  });

  it('error: the sentence as an alert, and "Try again" asks the page to load again', async () => {
    host().error.set('The cycles could not be loaded. Database asleep');
    await fixture.whenStable();
    const alert = el().querySelector('[role=alert]') as HTMLElement;
    expect(alert.textContent).toContain('The cycles could not be loaded. Database asleep');
    (alert.querySelector('button') as HTMLButtonElement).click();
    expect(host().retries).toBe(1);
  });

  it('lists each cycle as a link to [linkBase, id] with its code, title and lines (instants in UTC)', async () => {
    host().cycles.set(CYCLES);
    await fixture.whenStable();
    expect(el().querySelector('mat-nav-list')?.getAttribute('aria-label')).toBe('Cycles');
    expect(links().map((a) => a.getAttribute('href'))).toEqual(['/night-plans/7', '/night-plans/4']);
    expect(links().map((a) => a.getAttribute('data-testid'))).toEqual(['plan-cycle-7', 'plan-cycle-4']);
    const lines = (a: HTMLAnchorElement) => [...a.querySelectorAll('[matListItemLine]')].map((l) => l.textContent?.trim());
    expect(links()[0].querySelector('[matListItemTitle]')?.textContent?.trim()).toBe('2027A · Lantern season');
    expect(lines(links()[0])).toEqual(['5 programs', 'Last built 20 Feb 2027, 09:00 UTC']);
    expect(lines(links()[1])).toEqual(['Not built yet']);
    // Material sizes each item by its lines: title + 2 lines, title + 1 line.
    expect(links()[0].classList).toContain('mdc-list-item--with-three-lines');
    expect(links()[1].classList).toContain('mdc-list-item--with-two-lines');
  });

  it('no item test ids when none is asked for', async () => {
    host().itemTestId.set(null);
    host().cycles.set(CYCLES);
    await fixture.whenStable();
    expect(links().map((a) => a.getAttribute('data-testid'))).toEqual([null, null]);
  });

  it('selectedId marks that cycle (activated, aria-current) and only it; following a link emits its id', async () => {
    host().cycles.set(CYCLES);
    host().selectedId.set(4);
    await fixture.whenStable();
    expect(links().map((a) => a.getAttribute('aria-current'))).toEqual([null, 'page']);
    expect(links()[1].classList).toContain('mdc-list-item--activated');
    expect(links()[0].classList).not.toContain('mdc-list-item--activated');
    links()[0].click();
    expect(host().chosen).toEqual([7]);
  });
});
