import { HttpErrorResponse } from '@angular/common/http';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { csvRowErrorsOf, UploadRefusal } from './upload-refusal';

describe('UploadRefusal', () => {
  let fixture: ComponentFixture<UploadRefusal>;
  const text = () => (fixture.nativeElement as HTMLElement).querySelector('[role=alert]')?.textContent?.replace(/\s+/g, ' ').trim();

  beforeEach(() => {
    TestBed.configureTestingModule({ imports: [UploadRefusal] });
    fixture = TestBed.createComponent(UploadRefusal);
    fixture.componentRef.setInput('message', 'The target list has problems.');
  });

  it('without listed rows: the message alone, as an alert', async () => {
    await fixture.whenStable();
    expect(text()).toBe('error The target list has problems.');
  });

  it('with listed rows: says nothing was stored and how many problems to fix (singular and plural)', async () => {
    fixture.componentRef.setInput('problems', 1);
    await fixture.whenStable();
    expect(text()).toContain('Nothing was stored: fix the 1 problem below and upload the file again.');
    fixture.componentRef.setInput('problems', 1200);
    await fixture.whenStable();
    expect(text()).toContain('Nothing was stored: fix the 1,200 problems below and upload the file again.');
  });
});

describe('csvRowErrorsOf', () => {
  const refused = (body: unknown) => new HttpErrorResponse({ status: 400, error: body });

  it('the rows of a 400 API body; none when the body has no rows, is not an API body, or the error is not HTTP', () => {
    const rows = [{ row: 2, field: 'ra', message: 'not a right ascension' }];
    expect(csvRowErrorsOf(refused({ code: 'invalid_target_list', message: 'Problems.', rows }))).toEqual(rows);
    expect(csvRowErrorsOf(refused({ code: 'wrong_encoding', message: 'Not UTF-8.' }))).toEqual([]);
    expect(csvRowErrorsOf(refused({ code: 'x', message: 'y', rows: 'many' }))).toEqual([]);
    expect(csvRowErrorsOf(refused('Bad Request'))).toEqual([]);
    expect(csvRowErrorsOf(new Error('offline'))).toEqual([]);
  });
});
