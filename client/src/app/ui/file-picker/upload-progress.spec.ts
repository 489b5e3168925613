import { ComponentFixture, TestBed } from '@angular/core/testing';
import { UploadProgress } from './upload-progress';

describe('UploadProgress', () => {
  let fixture: ComponentFixture<UploadProgress>;
  const el = () => fixture.nativeElement as HTMLElement;
  const bar = () => el().querySelector('mat-progress-bar');

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [UploadProgress] });
    fixture = TestBed.createComponent(UploadProgress);
    fixture.componentRef.setInput('label', 'Uploading the justification');
    fixture.componentRef.setInput('testId', 'pdf-progress');
    await fixture.whenStable();
  });

  it('idle: no bar and no percentage', () => {
    expect(bar()).toBeNull();
    expect(el().textContent?.trim()).toBe('');
  });

  it('a known percentage: a determinate bar with its name and "N % sent"', async () => {
    fixture.componentRef.setInput('progress', 50);
    await fixture.whenStable();
    expect(bar()?.getAttribute('mode')).toBe('determinate');
    expect(bar()?.getAttribute('aria-valuenow')).toBe('50');
    expect(bar()?.getAttribute('aria-label')).toBe('Uploading the justification');
    expect(bar()?.getAttribute('data-testid')).toBe('pdf-progress');
    expect(el().textContent).toContain('50 % sent');
  });

  it('unknown: an indeterminate bar without a percentage', async () => {
    fixture.componentRef.setInput('progress', 'unknown');
    await fixture.whenStable();
    expect(bar()?.getAttribute('mode')).toBe('indeterminate');
    expect(el().textContent).not.toContain('% sent');
  });
});
