import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { formatMinorCurrency } from './format-units';

/**
 * `{{ node.rateMinorPerHour | minorCurrency: node.currency }}` → `€48.50`: the one way a
 * template shows money (amounts are held in minor units, the currency comes from the data).
 */
@Pipe({ name: 'minorCurrency' })
export class MinorCurrencyPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(amountMinor: number | null | undefined, currency: string | null | undefined): string {
    return formatMinorCurrency(amountMinor, currency, this.locale);
  }
}
