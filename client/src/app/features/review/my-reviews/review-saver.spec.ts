import { HttpErrorResponse } from '@angular/common/http';
import type { MyReviewRow, SaveReviewInput } from '@spincycle/shared/review/reviewing';
import { Observable, Subject } from 'rxjs';
import { reviewRow } from './testing/review-fixtures';
import { parseGrade, retryDelayMs, ReviewSaver, SAVE_DEBOUNCE_MS } from './review-saver';

const ROW: MyReviewRow = reviewRow();

describe('parseGrade', () => {
  it('reads 0.0–10.0 with one decimal (comma too); empty is no grade; refuses 7.25, 10.5 and words', () => {
    expect(parseGrade('')).toEqual({ grade: null });
    expect(parseGrade(' 7.3 ')).toEqual({ grade: 7.3 });
    expect(parseGrade('7,3')).toEqual({ grade: 7.3 });
    expect(parseGrade('10')).toEqual({ grade: 10 });
    expect(parseGrade('0')).toEqual({ grade: 0 });
    expect(parseGrade('7.25')).toEqual({ error: 'Use at most one decimal, for example 7.2 or 7.3' });
    expect(parseGrade('10.5')).toEqual({ error: 'Enter a grade from 0.0 to 10.0' });
    expect(parseGrade('-1')).toEqual({ error: 'Enter a grade from 0.0 to 10.0' });
    expect(parseGrade('good')).toEqual({ error: 'Enter a grade from 0.0 to 10.0' });
  });

  it('retry waits grow 2, 4, 8 s… up to a minute (common practice, no source)', () => {
    expect([1, 2, 3, 4, 10].map(retryDelayMs)).toEqual([2000, 4000, 8000, 16000, 60000]);
  });
});

describe('ReviewSaver', () => {
  let calls: { input: SaveReviewInput; reply: Subject<MyReviewRow> }[];
  const send = (input: SaveReviewInput): Observable<MyReviewRow> => {
    const reply = new Subject<MyReviewRow>();
    calls.push({ input, reply });
    return reply;
  };
  beforeEach(() => {
    calls = [];
    jest.useFakeTimers();
  });
  afterEach(() => jest.useRealTimers());

  it('waits for a quiet moment, sends the version it read, then shows saved and takes the new version', () => {
    const saved: MyReviewRow[] = [];
    const s = new ReviewSaver(ROW, send, (r) => saved.push(r));
    s.edit({ grade: 7 });
    s.edit({ grade: 7.5 });
    expect(s.status()).toBe('pending');
    jest.advanceTimersByTime(SAVE_DEBOUNCE_MS - 1);
    expect(calls).toHaveLength(0);
    jest.advanceTimersByTime(1);
    expect(calls).toHaveLength(1);
    expect(calls[0].input).toEqual({ version: 1, grade: 7.5, strengths: '', weaknesses: '', committeeNote: '' });
    expect(s.status()).toBe('saving');
    calls[0].reply.next({ ...ROW, grade: 7.5, version: 2 });
    expect(s.status()).toBe('saved');
    expect(saved.map((r) => r.version)).toEqual([2]);
    s.edit({ strengths: 'Clear.' });
    s.flush();
    expect(calls[1].input.version).toBe(2);
  });

  it('a failed save stays visible and retries by itself after the backoff; the retry button sends at once', () => {
    const s = new ReviewSaver(ROW, send);
    s.edit({ grade: 6 });
    s.flush();
    calls[0].reply.error(new HttpErrorResponse({ status: 0 }));
    expect(s.status()).toBe('failed');
    expect(s.message()).toContain('Trying again in 2 s');
    jest.advanceTimersByTime(2000);
    expect(calls).toHaveLength(2);
    calls[1].reply.error(new HttpErrorResponse({ status: 503 }));
    expect(s.message()).toContain('Trying again in 4 s');
    s.retry();
    expect(calls).toHaveLength(3);
    expect(calls[2].input.grade).toBe(6);
    calls[2].reply.next({ ...ROW, grade: 6, version: 2 });
    expect(s.status()).toBe('saved');
    jest.advanceTimersByTime(10_000);
    expect(calls).toHaveLength(3);
  });

  it('a change made elsewhere (409 version_conflict) shows the stored review and stops; a locked review stops too', () => {
    const s = new ReviewSaver(ROW, send);
    s.edit({ grade: 6 });
    s.flush();
    const current = { ...ROW, grade: 8.1, version: 4 };
    calls[0].reply.error(new HttpErrorResponse({ status: 409, error: { code: 'version_conflict', message: 'saved elsewhere', current } }));
    expect(s.status()).toBe('conflict');
    expect(s.row().grade).toBe(8.1);
    expect(s.current().grade).toBe(8.1);
    s.edit({ grade: 5 });
    s.flush();
    expect(calls[1].input.version).toBe(4);
    calls[1].reply.error(new HttpErrorResponse({ status: 409, error: { code: 'review_locked', message: 'The review deadline passed' } }));
    expect(s.status()).toBe('locked');
    expect(s.message()).toBe('The review deadline passed');
    s.edit({ grade: 1 });
    jest.advanceTimersByTime(60_000);
    expect(calls).toHaveLength(2);
  });

  it('an invalid grade sends nothing', () => {
    const s = new ReviewSaver(ROW, send);
    s.invalid('Use at most one decimal');
    s.flush();
    jest.advanceTimersByTime(5000);
    expect(calls).toHaveLength(0);
    expect(s.status()).toBe('invalid');
  });
});
