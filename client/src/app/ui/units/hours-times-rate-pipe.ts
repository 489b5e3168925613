import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { formatHoursTimesRate } from './format-units';

/**
 * `{{ r.nodeHours | hoursTimesRate: node.rateMinorPerHour : node.currency : r.feeMinor }}` →
 * `42.5 h × €48.50 per hour = €2,061.25`: a fee explained in money, never in minor units.
 */
@Pipe({ name: 'hoursTimesRate' })
export class HoursTimesRatePipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(hours: number | null | undefined, rateMinorPerHour: number, currency: string, feeMinor?: number | null): string {
    if (hours === null || hours === undefined || !Number.isFinite(hours)) return '';
    return formatHoursTimesRate(hours, rateMinorPerHour, currency, this.locale, feeMinor);
  }
}
