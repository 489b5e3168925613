import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { FileCheck, FilePicker } from './file-picker';

const MB = 1024 * 1024;

@Component({
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [FilePicker],
  template: `
    <p id="columns-hint">The columns the file needs.</p>
    <app-file-picker
      accept=".csv,text/csv"
      [label]="label()"
      [maxBytes]="maxBytes()"
      [check]="check()"
      [description]="description()"
      [describedBy]="describedBy()"
      [disabled]="disabled()"
      testId="csv"
      [file]="file()"
      (fileChange)="chosen.push($event); file.set($event)"
    />
  `,
})
class Host {
  readonly label = signal('CSV file');
  readonly maxBytes = signal<number | null>(null);
  readonly check = signal<FileCheck | null>(null);
  readonly description = signal('');
  readonly describedBy = signal('');
  readonly disabled = signal(false);
  readonly file = signal<File | null>(null);
  readonly chosen: (File | null)[] = [];
}

function csv(name: string, size = 20): File {
  const file = new File(['name,ra,dec\n'], name, { type: 'text/csv' });
  Object.defineProperty(file, 'size', { value: size });
  return file;
}

describe('FilePicker', () => {
  let fixture: ComponentFixture<Host>;
  const el = () => fixture.nativeElement as HTMLElement;
  const native = () => el().querySelector('[data-testid=csv-input]') as HTMLInputElement;
  const button = () => el().querySelector('[data-testid=choose-csv]') as HTMLButtonElement;
  const fileName = () => el().querySelector('[data-testid=csv-file-name]')?.textContent?.trim();
  const problem = () => el().querySelector('[data-testid=csv-problem]');

  async function choose(file: File): Promise<void> {
    Object.defineProperty(native(), 'files', { value: [file], configurable: true });
    native().dispatchEvent(new Event('change'));
    await fixture.whenStable();
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [Host] });
    fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
  });

  it('the native input is hidden; an outlined Material button with an accessible name opens its chooser', async () => {
    expect(native().hidden).toBe(true);
    expect(native().type).toBe('file');
    expect(native().accept).toBe('.csv,text/csv');
    const click = jest.spyOn(native(), 'click').mockImplementation(() => undefined);
    const harness = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatButtonHarness.with({ text: /Choose a CSV file/ }));
    expect(await harness.getAppearance()).toBe('outlined');
    await harness.click();
    expect(click).toHaveBeenCalledTimes(1);
    // A real <button type=button>: Enter and Space open the chooser as on any button, and it submits no form.
    const host = await harness.host();
    expect(await host.getProperty('tagName')).toBe('BUTTON');
    expect(await host.getAttribute('type')).toBe('button');
    expect(await host.getAttribute('aria-describedby')).toBe('csv-file-name');
    expect(el().querySelector('#csv-file-name')?.textContent?.trim()).toBe('No file chosen');
  });

  it('a chosen file: emitted, its name describes the button, the button offers another, the native input is emptied', async () => {
    const file = csv('lantern-cluster-members.csv');
    await choose(file);
    expect(fixture.componentInstance.chosen).toEqual([file]);
    expect(fileName()).toBe('lantern-cluster-members.csv');
    expect(el().querySelector('#csv-file-name')?.getAttribute('title')).toBe('lantern-cluster-members.csv');
    expect(button().textContent?.trim()).toBe('attach_file Choose another CSV file');
    // Emptied so that choosing the same file again (after fixing it) is a change again.
    expect(native().value).toBe('');
    expect(problem()).toBeNull();
  });

  it('the owner clears the file after an upload: "No file chosen" again', async () => {
    await choose(csv('members.csv'));
    fixture.componentInstance.file.set(null);
    await fixture.whenStable();
    expect(fileName()).toBe('No file chosen');
    expect(button().textContent).toContain('Choose a CSV file');
  });

  it('a file over maxBytes is refused in plain words, said as an alert and described on the button; a smaller one then passes', async () => {
    fixture.componentInstance.maxBytes.set(5 * MB);
    await fixture.whenStable();
    await choose(csv('huge.csv', 12 * MB));
    expect(fixture.componentInstance.chosen).toEqual([null]);
    expect(fileName()).toBe('No file chosen');
    expect(problem()?.getAttribute('role')).toBe('alert');
    expect(problem()?.textContent?.trim()).toBe('huge.csv is 12 MB, more than the 5 MB allowed. Choose a smaller file.');
    expect(button().getAttribute('aria-describedby')).toBe('csv-file-name csv-problem');

    const small = csv('small.csv', 5 * MB);
    await choose(small);
    expect(fixture.componentInstance.chosen).toEqual([null, small]);
    expect(problem()).toBeNull();
    expect(fileName()).toBe('small.csv');
  });

  it('a refused file replaces the one chosen before: nothing is left to send', async () => {
    fixture.componentInstance.maxBytes.set(MB);
    await choose(csv('good.csv'));
    await choose(csv('huge.csv', 2 * MB));
    expect(fixture.componentInstance.file()).toBeNull();
    expect(fileName()).toBe('No file chosen');
  });

  it('check: its sentence refuses the file; it runs after the size check', async () => {
    const seen: string[] = [];
    fixture.componentInstance.maxBytes.set(MB);
    fixture.componentInstance.check.set((file) => {
      seen.push(file.name);
      return file.name.endsWith('.csv') ? null : `${file.name} is not a CSV file.`;
    });
    await fixture.whenStable();
    await choose(csv('notes.txt'));
    expect(problem()?.textContent?.trim()).toBe('notes.txt is not a CSV file.');
    expect(fixture.componentInstance.chosen).toEqual([null]);
    await choose(csv('big.txt', 2 * MB));
    expect(problem()?.textContent).toContain('big.txt is 2 MB, more than the 1 MB allowed.');
    expect(seen).toEqual(['notes.txt']);
  });

  it('description and describedBy describe the button too', async () => {
    fixture.componentInstance.description.set('One row per target, with a header row.');
    fixture.componentInstance.describedBy.set('columns-hint');
    await fixture.whenStable();
    expect(el().querySelector('#csv-description')?.textContent?.trim()).toBe('One row per target, with a header row.');
    expect(button().getAttribute('aria-describedby')).toBe('csv-file-name csv-description columns-hint');
  });

  it('disabled while an upload is on its way: neither the button nor the input can be used', async () => {
    fixture.componentInstance.disabled.set(true);
    await fixture.whenStable();
    expect(button().disabled).toBe(true);
    expect(native().disabled).toBe(true);
  });

  it('the article follows the label: "Choose a PDF", "Choose an image"', async () => {
    fixture.componentInstance.label.set('PDF');
    await fixture.whenStable();
    expect(button().textContent).toContain('Choose a PDF');
    fixture.componentInstance.label.set('image');
    await fixture.whenStable();
    expect(button().textContent).toContain('Choose an image');
  });
});
