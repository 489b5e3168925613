import { Injectable, Provider } from '@angular/core';
import { DateAdapter, MAT_DATE_FORMATS, MatDateFormats, NativeDateAdapter } from '@angular/material/core';
import { fromCalendarDate, toCalendarDate } from './utc-instant';

/** The input shows and reads dates as `YYYY-MM-DD` (the same everywhere, whatever the browser's locale). */
const ISO_INPUT = 'iso-calendar-date';

const CALENDAR_DATE_FORMATS: MatDateFormats = {
  parse: { dateInput: ISO_INPUT },
  display: {
    dateInput: ISO_INPUT,
    monthYearLabel: { year: 'numeric', month: 'short' },
    dateA11yLabel: { year: 'numeric', month: 'long', day: 'numeric' },
    monthYearA11yLabel: { year: 'numeric', month: 'long' },
  },
};

/**
 * The native adapter with calendar dates written `YYYY-MM-DD`. A date typed or stored that way
 * is that calendar day (local midnight inside the picker), never an instant shifted by the
 * browser's time zone: the cycle form turns it back into `YYYY-MM-DD` before anything is sent.
 */
@Injectable()
export class CalendarDateAdapter extends NativeDateAdapter {
  override parse(value: unknown, parseFormat: unknown): Date | null {
    if (typeof value === 'string') {
      if (!value.trim()) return null;
      return fromCalendarDate(value) ?? this.invalid();
    }
    return super.parse(value, parseFormat);
  }

  override format(date: Date, displayFormat: unknown): string {
    return displayFormat === ISO_INPUT ? toCalendarDate(date) : super.format(date, displayFormat as Intl.DateTimeFormatOptions);
  }

  override deserialize(value: unknown): Date | null {
    if (typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value)) return fromCalendarDate(value);
    return super.deserialize(value);
  }
}

/** Providers of the cycle form's datepickers. */
export function provideCalendarDates(): Provider[] {
  return [
    { provide: DateAdapter, useClass: CalendarDateAdapter },
    { provide: MAT_DATE_FORMATS, useValue: CALENDAR_DATE_FORMATS },
  ];
}
