import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { explainFee } from './format-units';

/**
 * `{{ row.why.feeMinor | feeWhy: row.currency }}`: the science core's fee line ("1.83 h × 4500
 * per hour") with the rate written as money (`1.83 h × €45.00 per hour`).
 */
@Pipe({ name: 'feeWhy' })
export class FeeWhyPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(why: string | null | undefined, currency: string): string {
    return explainFee(why, currency, this.locale);
  }
}
