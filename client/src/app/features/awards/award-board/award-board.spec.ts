import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { provideRouter } from '@angular/router';
import type { AwardBoard } from '@spincycle/shared/awards/awards';
import { AUDIT, ROW_AWARDED, ROW_RESERVE, ROW_UNDECIDED, testBoard, testDecision } from '../testing/award-fixtures';
import AwardBoardPage, { releaseSummary } from './award-board';

const BOARD_URL = '/api/awards/cycles/7';
const PUT_11 = '/api/awards/proposals/11';

/** Text with runs of white space folded and icon ligatures removed. */
function text(el: Element | null | undefined): string {
  if (!el) return '';
  const copy = el.cloneNode(true) as HTMLElement;
  copy.querySelectorAll('mat-icon').forEach((icon) => icon.remove());
  return (copy.textContent ?? '').replace(/\s+/g, ' ').trim();
}

/** Every panel holding proposals has locked its standing. */
function allLocked(board: AwardBoard): AwardBoard {
  return { ...board, panels: board.panels.filter((p) => p.standingLocked) };
}

/** The board after row 11 is awarded 117.5 h on KRG-50 (worked by hand: 220 − 117.5 = 102.5 remain). */
function boardAfterAward(overrideReason: string | null = null): AwardBoard {
  const board = testBoard();
  return {
    ...board,
    nodes: board.nodes.map((n) => (n.nodeId === 1 ? { ...n, awardedHours: 517.5, remainingHours: 102.5 } : n)),
    rows: [
      ROW_RESERVE,
      { ...ROW_UNDECIDED, award: testDecision({ nodes: [{ nodeId: 1, nodeHours: 117.5 }], overrideReason, version: 1 }) },
      ROW_AWARDED,
    ],
    undecided: 0,
  };
}

describe('AwardBoardPage', () => {
  let fixture: ComponentFixture<AwardBoardPage>;
  let backend: HttpTestingController;
  let snackOpen: jest.Mock;

  async function render(board: AwardBoard | null = testBoard(), id = '7'): Promise<HTMLElement> {
    snackOpen = jest.fn();
    TestBed.configureTestingModule({
      imports: [AwardBoardPage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: MatSnackBar, useValue: { open: snackOpen } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AwardBoardPage);
    fixture.componentRef.setInput('cycleId', id);
    fixture.detectChanges();
    if (board) {
      backend.expectOne(BOARD_URL).flush(board);
      await fixture.whenStable();
    }
    return fixture.nativeElement as HTMLElement;
  }

  afterEach(() => {
    backend.verify();
    document.querySelectorAll('.cdk-overlay-container').forEach((c) => (c.innerHTML = ''));
  });

  const el = () => fixture.nativeElement as HTMLElement;
  const q = (testId: string) => el().querySelector(`[data-testid="${testId}"]`);
  const hours = (row: number, code: string) => q(`hours-${row}-${code}`) as HTMLInputElement;

  async function chooseOutcome(row: number, label: string): Promise<void> {
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const select = await loader.getHarness(MatSelectHarness.with({ selector: `[data-testid="outcome-${row}"]` }));
    await select.open();
    await select.clickOptions({ text: label });
    await fixture.whenStable();
  }

  async function type(input: HTMLInputElement, value: string): Promise<void> {
    input.value = value;
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }

  async function pressEnter(input: HTMLInputElement): Promise<void> {
    input.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true }));
    await fixture.whenStable();
  }

  /** The overlay's dialog element of the given selector. */
  const dialogEl = (selector: string) => document.querySelector(selector) as HTMLElement;
  const dialogButton = (selector: string, label: string) =>
    Array.from(dialogEl(selector).querySelectorAll('button')).find((b) => b.textContent?.trim() === label) as HTMLButtonElement;

  it('shows the capacity per node from the board: bars in words and a table of the numbers, the overrun named', async () => {
    await render();
    expect(el().querySelector('h1')?.textContent).toContain('Awards of 2027A');
    const cells = (code: string) => Array.from(q(`capacity-${code}`)!.querySelectorAll('td')).map((td) => text(td));
    // Offered, expected clear (loss), awarded, remaining, reserve, requested: the fixture's numbers.
    expect(cells('KRG-50')).toEqual(['620', '496 (20 % loss)', '400', '220', '50', '567.5']);
    expect(cells('VHM-40')).toEqual(['480', '336 (30 % loss)', '500', '-20', '0', '500']);
    expect(q('capacity-VHM-40')!.classList).toContain('past');
    expect(text(q('capacity-bar-KRG-50'))).toContain('220 h left of 620 h; reserve 50 h');
    expect(text(q('capacity-bar-VHM-40'))).toContain('Past capacity: 500 h awarded, 20 h more than the 480 h offered');
    expect(q('capacity-bar-VHM-40')!.classList).toContain('past');
  });

  it('lists the proposals by panel and standing position, and the panels still ranking with a note', async () => {
    await render();
    const panels = Array.from(el().querySelectorAll('.panel-row')).map((r) => text(r));
    expect(panels).toEqual(['Panel Ember', 'Panel Lantern']);
    const rows = Array.from(el().querySelectorAll('[data-testid^="row-"]')).map((r) => r.getAttribute('data-testid'));
    expect(rows).toEqual(['row-13', 'row-11', 'row-12']);
    const row11 = text(q('row-11'));
    expect(row11).toContain('Spin-down of an invented cluster');
    expect(row11).toContain('Mara Quillfeather');
    expect(row11).toContain('0.61');
    expect(row11).toContain('KRG-50 117.5');
    expect(text(q('open-panels'))).toContain('Panel Harbour (4 proposals): its proposals appear here once the chair locks the standing.');
    // The stored decision fills its row.
    expect(hours(12, 'KRG-50').value).toBe('400');
    expect(hours(12, 'VHM-40').value).toBe('500');
    expect(text(q('status-12'))).toContain('Decided by Ines Farrow; past capacity: Long baseline agreed by the consortium');
    expect(text(q('status-11'))).toBe('No decision yet');
  });

  it('choosing Awarded fills in the request, and what the decision leaves follows the hours as they are typed', async () => {
    await render();
    expect(hours(11, 'KRG-50').disabled).toBe(true);
    await chooseOutcome(11, 'Awarded');
    expect(hours(11, 'KRG-50').value).toBe('117.5');
    expect(hours(11, 'KRG-50').disabled).toBe(false);
    // 220 remain on KRG-50; 220 − 117.5 = 102.5 (worked by hand).
    expect(text(q('left-11'))).toBe('leaves 102.5 h of 620 h on KRG-50');
    await type(hours(11, 'KRG-50'), '200');
    expect(text(q('left-11'))).toBe('leaves 20 h of 620 h on KRG-50');
    await type(hours(11, 'KRG-50'), '250');
    expect(text(q('left-11'))).toBe('takes KRG-50 30 h past its 620 h');
    expect(q('left-11')!.querySelector('li')!.classList).toContain('past');
    expect(text(q('status-11'))).toBe('Not saved yet');
    // A row being changed holds back the release.
    expect(text(q('release-why'))).toContain('1 ranked proposal still needs a decision.');
  });

  it("a stored award's own hours are given back before the new ones count", async () => {
    await render();
    // Row 12 holds 400 on KRG-50, where 220 remain: lowering it to 300 leaves 220 + 400 − 300 = 320 (worked by hand).
    await type(hours(12, 'KRG-50'), '300');
    expect(text(q('left-12'))).toContain('leaves 320 h of 620 h on KRG-50');
    // On VHM-40 it holds 500 of 480, −20 remaining: −20 + 500 − 500 = −20.
    expect(text(q('left-12'))).toContain('takes VHM-40 20 h past its 480 h');
  });

  it('Enter in an hours field saves the row with its version, outcome, nodes and targets, and the row says saved', async () => {
    await render();
    await chooseOutcome(11, 'Awarded');
    await pressEnter(hours(11, 'KRG-50'));
    const req = backend.expectOne(PUT_11);
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({
      version: 0,
      outcome: 'awarded',
      nodes: [{ nodeId: 1, nodeHours: 117.5 }],
      targetIds: null,
      overrideReason: null,
    });
    expect(text(q('status-11'))).toBe('Saving…');
    req.flush(boardAfterAward());
    await fixture.whenStable();
    expect(text(q('status-11'))).toBe('Saved.');
    expect(q('status-11')!.getAttribute('data-state')).toBe('saved');
    // The capacity follows the answer.
    expect(text(q('capacity-KRG-50'))).toContain('102.5');
    // Decided, but one panel still ranks.
    expect(text(q('release-why'))).toBe('1 panel has not locked its standing yet.');
    expect((q('release-button') as HTMLButtonElement).disabled).toBe(true);
  });

  it('a partial award: the targets dialog marks the feasible targets and the save names the chosen ones', async () => {
    await render();
    await chooseOutcome(11, 'Awarded');
    (q('targets-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    const dialog = dialogEl('app-targets-dialog');
    expect(text(dialog)).toContain('3 of 3 chosen');
    expect(text(dialog.querySelector('li:nth-child(3)'))).toContain('no feasible plan');
    dialogButton('app-targets-dialog', 'Feasible only (2)').click();
    await fixture.whenStable();
    expect(text(dialog)).toContain('2 of 3 chosen');
    dialogButton('app-targets-dialog', 'Use these targets').click();
    await fixture.whenStable();
    expect(text(q('targets-11'))).toBe('2 of 3');

    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    const req = backend.expectOne(PUT_11);
    expect(req.request.body.targetIds).toEqual([101, 102]);
    req.flush(boardAfterAward());
    await fixture.whenStable();
  });

  it('409 capacity_exceeded: the dialog names the node and asks a reason, then sends again with it', async () => {
    await render();
    await chooseOutcome(11, 'Awarded');
    await type(hours(11, 'KRG-50'), '250');
    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend.expectOne(PUT_11).flush(
      {
        code: 'capacity_exceeded',
        message: 'This award would take a node past what the cycle offers.',
        fieldErrors: {
          'nodes.0.nodeHours': ['KRG-50 offers 620.00 node-hours and 400.00 are already awarded; 250.00 more would leave -30.00'],
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    const dialog = dialogEl('app-capacity-dialog');
    expect(text(dialog.querySelector('[data-testid="capacity-messages"]'))).toBe(
      'KRG-50 offers 620.00 node-hours and 400.00 are already awarded; 250.00 more would leave -30.00',
    );
    expect(text(dialog)).toContain("The facility's own allocation rules govern");
    expect(text(dialog)).toContain('may displace other programs');
    const confirm = dialogButton('app-capacity-dialog', 'Award past capacity');
    expect(confirm.disabled).toBe(true);
    const reason = dialog.querySelector('textarea')!;
    reason.value = 'Only node with the southern targets';
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(confirm.disabled).toBe(false);
    confirm.click();
    await fixture.whenStable();

    const again = backend.expectOne(PUT_11);
    expect(again.request.body).toEqual({
      version: 0,
      outcome: 'awarded',
      nodes: [{ nodeId: 1, nodeHours: 250 }],
      targetIds: null,
      overrideReason: 'Only node with the southern targets',
    });
    again.flush(boardAfterAward('Only node with the southern targets'));
    await fixture.whenStable();
    expect(text(q('status-11'))).toBe('Saved past capacity, with your reason.');
  });

  it('409 capacity_exceeded cancelled: nothing more is sent and the row says why it is not saved', async () => {
    await render();
    await chooseOutcome(11, 'Awarded');
    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend
      .expectOne(PUT_11)
      .flush(
        { code: 'capacity_exceeded', message: 'Past capacity.', fieldErrors: { 'nodes.0.nodeHours': ['takes the node past capacity'] } },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    dialogButton('app-capacity-dialog', 'Cancel').click();
    await fixture.whenStable();
    backend.expectNone(PUT_11);
    expect(text(q('status-11'))).toBe('Not saved: the award would take a node past its capacity.');
    expect(text(dialogEl('app-capacity-dialog'))).toBe('');
    expect(text(el().querySelector('#hours-error-11-1'))).toBe('takes the node past capacity');
  });

  it('409 stale_version: shows the row as it is now, says so, and reads the capacity again', async () => {
    await render();
    await chooseOutcome(11, 'Not awarded');
    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    const now = boardAfterAward().rows[1];
    backend
      .expectOne(PUT_11)
      .flush({ code: 'stale_version', message: 'Changed meanwhile.', row: now }, { status: 409, statusText: 'Conflict' });
    TestBed.tick();
    expect(hours(11, 'KRG-50').value).toBe('117.5');
    expect(q('status-11')!.getAttribute('data-state')).toBe('stale');
    backend.expectOne(BOARD_URL).flush(boardAfterAward());
    await fixture.whenStable();
    expect(q('status-11')!.getAttribute('data-state')).toBe('stale');
    expect(text(q('status-11'))).toContain('Someone else changed this decision meanwhile');
    expect(text(q('capacity-KRG-50'))).toContain('102.5');
    // The next save names the version read now.
    await chooseOutcome(11, 'Reserve');
    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    const next = backend.expectOne(PUT_11);
    expect(next.request.body).toMatchObject({ version: 1, outcome: 'reserve', nodes: [{ nodeId: 1, nodeHours: 117.5 }] });
    next.flush(boardAfterAward());
    await fixture.whenStable();
  });

  it('409 stale_version without the row: reads the board again and shows the stored decision', async () => {
    await render();
    await chooseOutcome(11, 'Not awarded');
    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend.expectOne(PUT_11).flush({ code: 'stale_version', message: 'Changed meanwhile.' }, { status: 409, statusText: 'Conflict' });
    // Not whenStable: the board's read holds it off until answered.
    TestBed.tick();
    expect(text(q('status-11'))).toContain('reading it again');
    backend.expectOne(BOARD_URL).flush(boardAfterAward());
    await fixture.whenStable();
    expect(hours(11, 'KRG-50').value).toBe('117.5');
    expect(q('status-11')!.getAttribute('data-state')).toBe('stale');
    expect(text(q('status-11'))).toContain('Someone else changed this decision meanwhile');
  });

  it('400: the message shows beside the field it names', async () => {
    await render();
    await chooseOutcome(11, 'Awarded');
    (q('save-11') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend.expectOne(PUT_11).flush(
      {
        code: 'validation_failed',
        message: 'nodes.0.nodeHours: the cycle does not offer this node',
        fieldErrors: { 'nodes.0.nodeHours': ['the cycle does not offer this node'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(text(el().querySelector('#hours-error-11-1'))).toBe('the cycle does not offer this node');
    expect(hours(11, 'KRG-50').getAttribute('aria-invalid')).toBe('true');
    expect(q('status-11')!.getAttribute('data-state')).toBe('failed');
  });

  it('hours the schema refuses are named before anything is sent', async () => {
    await render();
    await chooseOutcome(11, 'Awarded');
    await type(hours(11, 'KRG-50'), '12.345');
    await pressEnter(hours(11, 'KRG-50'));
    backend.expectNone(PUT_11);
    expect(text(el().querySelector('#hours-error-11-1'))).toBe('Node-hours must have at most two decimals.');
  });

  it('release: disabled while a proposal is undecided, with the count said', async () => {
    await render();
    const button = q('release-button') as HTMLButtonElement;
    expect(button.disabled).toBe(true);
    expect(text(q('release-why'))).toBe('1 ranked proposal still needs a decision.');
  });

  it('release: the confirmation needs the box ticked, sends {confirm: true} and reports the result', async () => {
    const decided = allLocked(boardAfterAward());
    await render(decided);
    const button = q('release-button') as HTMLButtonElement;
    expect(button.disabled).toBe(false);
    button.click();
    await fixture.whenStable();
    const dialog = dialogEl('app-release-dialog');
    expect(text(dialog)).toContain('2 awarded, 1 on reserve, 0 not awarded');
    expect(text(dialog)).toContain("reviewers' comments, with the reviewers' names left out");
    expect(text(dialog)).toContain('becomes a program');
    const release = dialogButton('app-release-dialog', 'Release decisions');
    expect(release.disabled).toBe(true);
    (dialog.querySelector('[data-testid="release-confirm"] input') as HTMLInputElement).click();
    await fixture.whenStable();
    expect(release.disabled).toBe(false);
    release.click();
    await fixture.whenStable();

    const req = backend.expectOne('/api/awards/cycles/7/release');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ confirm: true });
    const mailedAt = '2027-03-10T12:00:00Z';
    req.flush({
      board: {
        ...decided,
        cycle: { ...decided.cycle, releasedAt: mailedAt },
        // The first team's mail failed.
        rows: decided.rows.map((r, i) => ({ ...r, award: r.award && { ...r.award, mailedAt: i === 0 ? null : mailedAt } })),
      },
      mailed: 2,
      mailFailures: 1,
      programsCreated: 2,
    });
    await fixture.whenStable();
    expect(snackOpen).toHaveBeenCalledWith(
      'Decisions released: 2 teams mailed, 1 mail not sent yet (tried again automatically), 2 programs created.',
      'Dismiss',
      { duration: 12000 },
    );
    expect(text(q('released'))).toContain('Decisions released on');
    expect(text(q('released'))).toContain('The mail to 1 team failed; the next change of their decision mails them again.');
    expect(q('release-button')).toBeNull();
  });

  it('release: waits for every panel holding proposals to lock its standing', async () => {
    await render(boardAfterAward());
    expect((q('release-button') as HTMLButtonElement).disabled).toBe(true);
    expect(text(q('release-why'))).toBe('1 panel has not locked its standing yet.');
  });

  it('release cancelled: nothing is sent', async () => {
    await render(allLocked(boardAfterAward()));
    (q('release-button') as HTMLButtonElement).click();
    await fixture.whenStable();
    dialogButton('app-release-dialog', 'Cancel').click();
    await fixture.whenStable();
    backend.expectNone('/api/awards/cycles/7/release');
  });

  it('audit log tab: loads on opening and lists the entries newest first in plain words', async () => {
    await render();
    const tab = Array.from(el().querySelectorAll<HTMLElement>('[role="tab"]')).find((t) => t.textContent?.includes('Audit log'))!;
    tab.click();
    fixture.detectChanges();
    await Promise.resolve();
    fixture.detectChanges();
    TestBed.tick();
    backend.expectOne('/api/awards/cycles/7/audit').flush(AUDIT);
    await fixture.whenStable();
    const rows = Array.from(el().querySelectorAll('[data-testid="audit-table"] tbody tr')).map((r) =>
      Array.from(r.querySelectorAll('td')).map((td) => text(td)),
    );
    expect(rows).toEqual([
      [
        '3 Mar 2027, 10:30',
        'Ines Farrow',
        'Field dwarfs, second season',
        'Changed the decision',
        'Reserve: 400 h on KRG-50 → changed to Awarded: 400 h on KRG-50, 500 h on VHM-40 (2 targets only)',
        'Long baseline agreed by the consortium',
      ],
      ['2 Mar 2027, 09:00', 'Ines Farrow', 'Field dwarfs, second season', 'Decided', 'nothing → changed to Reserve: 400 h on KRG-50', '—'],
    ]);
  });

  it('empty: no ranked proposal yet says when they appear', async () => {
    await render(testBoard({ rows: [], undecided: 0 }));
    expect(el().textContent).toContain("No proposal is ranked yet: proposals appear here once a panel's chair locks its standing.");
    expect((q('release-button') as HTMLButtonElement).disabled).toBe(true);
  });

  it('error: the message of the refusal', async () => {
    await render(null);
    backend.expectOne(BOARD_URL).flush({ code: 'cycle_not_found', message: 'No cycle 7.' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(el().querySelector('[role="alert"]')?.textContent).toContain('The award board could not be loaded. No cycle 7.');
  });

  it('an address without a valid id says so without a request', async () => {
    await render(null, 'abc');
    await fixture.whenStable();
    expect(el().textContent).toContain('There is no cycle at this address.');
  });
});

describe('releaseSummary', () => {
  it('counts in words, failures only when there are some', () => {
    expect(releaseSummary({ mailed: 1, mailFailures: 0, programsCreated: 1 })).toBe(
      'Decisions released: 1 team mailed, 1 program created.',
    );
  });
});
