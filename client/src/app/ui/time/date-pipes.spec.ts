import { LOCALE_ID } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { DayPipe, LocalInstantPipe, UtcInstantPipe } from './date-pipes';

describe('date pipes', () => {
  const run = <T>(make: () => T) => {
    TestBed.configureTestingModule({ providers: [{ provide: LOCALE_ID, useValue: 'en-US' }] });
    return TestBed.runInInjectionContext(make);
  };

  it('day, utcInstant and localInstant wrap the one date format', () => {
    const [day, utc, local] = run(() => [new DayPipe(), new UtcInstantPipe(), new LocalInstantPipe()] as const);
    expect(day.transform('2027-01-16')).toBe('16 Jan 2027');
    expect(utc.transform('2027-01-16T00:00:00Z')).toBe('16 Jan 2027, 00:00 UTC');
    expect(utc.transform('2027-01-16T00:00:00Z', false)).toBe('16 Jan 2027, 00:00');
    expect(local.transform('2027-01-16T00:00:00Z', 'Asia/Tokyo')).toBe('16 Jan 2027, 09:00 Asia/Tokyo');
    expect(local.transform('2027-01-16T00:00:00Z', 'UTC')).toBe('');
  });
});
