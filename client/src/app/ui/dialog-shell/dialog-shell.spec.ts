import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialog, MatDialogRef } from '@angular/material/dialog';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { DialogConfirmTone, DialogShell } from './dialog-shell';

interface ShellState {
  tone: DialogConfirmTone;
  busy: boolean;
  error: string | null;
  confirmDisabled: boolean;
}

/** A dialog without a form: confirm emits, and the dialog closes with "yes". */
@Component({
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell],
  template: `
    <app-dialog-shell
      heading="Lock the standing?"
      confirmLabel="Lock"
      [cancelResult]="'no'"
      [tone]="state().tone"
      [busy]="state().busy"
      busyLabel="Locking the standing"
      [error]="state().error"
      [confirmDisabled]="state().confirmDisabled"
      confirmTestId="lock"
      (confirmed)="ref.close('yes')"
    >
      <p>Locking is final.</p>
    </app-dialog-shell>
  `,
})
class AskDialog {
  protected readonly ref = inject<MatDialogRef<AskDialog, string>>(MatDialogRef);
  readonly state = signal<ShellState>(inject(MAT_DIALOG_DATA));
}

/** A dialog with a form: the confirm button and Enter both reach ngSubmit. */
@Component({
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, ReactiveFormsModule],
  template: `
    <app-dialog-shell heading="Rename" confirmLabel="Save" form="rename-form">
      <form id="rename-form" [formGroup]="form" (ngSubmit)="submits = submits + 1">
        <input aria-label="Name" formControlName="name" />
      </form>
    </app-dialog-shell>
  `,
})
class FormDialog {
  readonly form = new FormGroup({ name: new FormControl('Lantern', { nonNullable: true }) });
  submits = 0;
}

@Component({ changeDetection: ChangeDetectionStrategy.OnPush, template: '' })
class Opener {}

const PLAIN: ShellState = { tone: 'plain', busy: false, error: null, confirmDisabled: false };

describe('DialogShell', () => {
  let fixture: ComponentFixture<Opener>;
  let dialog: MatDialog;
  /** The container of the dialog opened last (a closed one may linger while it animates out). */
  let current: MatDialogRef<unknown>;
  const overlay = () => document.getElementById(current.id) as HTMLElement;
  const button = (label: string) =>
    Array.from(overlay().querySelectorAll('mat-dialog-actions button')).find((b) => b.textContent?.trim() === label) as HTMLButtonElement;

  beforeEach(() => {
    TestBed.configureTestingModule({ imports: [Opener] });
    fixture = TestBed.createComponent(Opener);
    dialog = TestBed.inject(MatDialog);
  });
  afterEach(() => dialog.closeAll());

  async function open(state: Partial<ShellState> = {}) {
    const ref = dialog.open<AskDialog, ShellState, string>(AskDialog, { data: { ...PLAIN, ...state } });
    current = ref;
    await fixture.whenStable();
    return ref;
  }

  it('the title names the dialog; the content sits between it and Cancel, then the confirm button', async () => {
    await open();
    const harness = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    expect(await harness.getTitleText()).toBe('Lock the standing?');
    expect(await harness.getContentText()).toBe('Locking is final.');
    expect(await harness.getActionsText()).toBe('Cancel Lock');
    const container = overlay();
    expect(container.tagName).toBe('MAT-DIALOG-CONTAINER');
    const titleId = overlay().querySelector('[mat-dialog-title]')?.id;
    expect(titleId).toBeTruthy();
    expect(container.getAttribute('aria-labelledby')).toBe(titleId);
  });

  it('without a form: confirm is a plain button that emits; Cancel closes with cancelResult', async () => {
    const confirmed = await open();
    let result: string | undefined;
    confirmed.beforeClosed().subscribe((r) => (result = r));
    expect(button('Lock').type).toBe('button');
    expect(button('Lock').getAttribute('data-testid')).toBe('lock');
    button('Lock').click();
    await fixture.whenStable();
    expect(result).toBe('yes');

    const cancelled = await open();
    cancelled.beforeClosed().subscribe((r) => (result = r));
    button('Cancel').click();
    await fixture.whenStable();
    expect(result).toBe('no');
  });

  it('busy: a named progress bar and confirm is off (Cancel stays on)', async () => {
    await open({ busy: true });
    expect(overlay().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Locking the standing');
    expect(button('Lock').disabled).toBe(true);
    expect(button('Cancel').disabled).toBe(false);
  });

  it('error: the sentence as an alert in the content; confirmDisabled turns confirm off', async () => {
    await open({ error: 'The standing changed meanwhile.', confirmDisabled: true });
    const alert = overlay().querySelector('mat-dialog-content [role=alert]');
    expect(alert?.textContent?.trim()).toBe('The standing changed meanwhile.');
    expect(overlay().querySelector('mat-progress-bar')).toBeNull();
    expect(button('Lock').disabled).toBe(true);
  });

  it('tone: amber for a call to action, red for a destructive one, the theme otherwise', async () => {
    await open({ tone: 'destructive' });
    expect(button('Lock').classList).toContain('destructive');
    expect(button('Lock').classList).not.toContain('cta');
    dialog.closeAll();
    await open({ tone: 'cta' });
    expect(button('Lock').classList).toContain('cta');
    dialog.closeAll();
    await open();
    expect(button('Lock').classList).not.toContain('cta');
    expect(button('Lock').classList).not.toContain('destructive');
  });

  it('with a form: confirm is that form’s submit button (so it reaches ngSubmit), and it emits nothing itself', async () => {
    const ref = dialog.open(FormDialog);
    current = ref;
    await fixture.whenStable();
    const confirm = button('Save');
    expect(confirm.type).toBe('submit');
    expect(confirm.getAttribute('form')).toBe('rename-form');
    expect(confirm.form?.id).toBe('rename-form');
    confirm.click();
    await fixture.whenStable();
    expect(ref.componentInstance.submits).toBe(1);
  });
});
