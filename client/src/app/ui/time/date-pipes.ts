import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { formatDay, formatLocalInstant, formatUtcInstant } from './date-format';

/** `{{ cycle.campaignStart | day }}` → `16 Jan 2027` (instants: their UTC day). */
@Pipe({ name: 'day' })
export class DayPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(value: string | number | Date | null | undefined): string {
    return formatDay(value, this.locale);
  }
}

/**
 * `{{ cycle.callClosesAt | utcInstant }}` → `16 Jan 2027, 00:00 UTC`; `utcInstant: false` drops
 * the zone, for a table column whose header says "(UTC)" once.
 */
@Pipe({ name: 'utcInstant' })
export class UtcInstantPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(value: string | number | Date | null | undefined, withZone = true): string {
    return formatUtcInstant(value, this.locale, withZone);
  }
}

/**
 * `{{ cycle.callClosesAt | localInstant }}` → `16 Jan 2027, 01:00 Europe/Berlin`, or empty when
 * the person's clock reads as UTC (use it in `@if (at | localInstant; as local)`).
 */
@Pipe({ name: 'localInstant' })
export class LocalInstantPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(value: string | number | Date | null | undefined, timeZone?: string): string {
    return formatLocalInstant(value, this.locale, timeZone);
  }
}
