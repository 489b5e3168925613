import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { formatMinorCurrency } from './format-units';

/** `{{ node.rateMinorPerHour | minorCurrency: node.currency }}` → `€48.50`. */
@Pipe({ name: 'minorCurrency' })
export class MinorCurrencyPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(amountMinor: number | null | undefined, currency: string): string {
    if (amountMinor === null || amountMinor === undefined) return '';
    return formatMinorCurrency(amountMinor, currency, this.locale);
  }
}
