import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { TargetUpload } from './target-upload';

describe('TargetUpload file button', () => {
  let fixture: ComponentFixture<TargetUpload>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const input = () => el().querySelector('[data-testid=csv-input]') as HTMLInputElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [TargetUpload], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TargetUpload);
    fixture.componentRef.setInput('proposalId', 5);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  it('the native input is hidden; a Material button with an accessible name opens its chooser', async () => {
    expect(input().hidden).toBe(true);
    expect(input().accept).toBe('.csv,text/csv');
    const click = jest.spyOn(input(), 'click').mockImplementation(() => undefined);
    const button = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatButtonHarness.with({ text: /Choose a CSV file/ }));
    expect(await button.getAppearance()).toBe('outlined');
    await button.click();
    expect(click).toHaveBeenCalledTimes(1);
    // The button is a real <button>: Enter and Space work on it as on any button.
    const host = await button.host();
    expect(await host.getAttribute('type')).toBe('button');
    expect(await host.getAttribute('aria-describedby')).toBe('csv-file-name');
    expect(el().querySelector('#csv-file-name')?.textContent?.trim()).toBe('No file chosen');
  });

  it('shows the chosen file name (the description of the button) and enables Upload', async () => {
    const file = new File(['name,ra,dec\n'], 'lantern-cluster-members.csv', { type: 'text/csv' });
    Object.defineProperty(input(), 'files', { value: [file] });
    input().dispatchEvent(new Event('change'));
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=csv-file-name]')?.textContent?.trim()).toBe('lantern-cluster-members.csv');
    expect(el().querySelector('[data-testid=choose-csv]')?.textContent).toContain('Choose another CSV file');
    const upload = Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.trim().endsWith('Upload')) as HTMLButtonElement;
    expect(upload.disabled).toBe(false);
  });
});
