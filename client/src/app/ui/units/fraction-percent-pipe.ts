import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { formatPercent } from './format-units';

/** `{{ row.completeness | fractionPercent }}` → `90 %` (a probability held as 0–1). */
@Pipe({ name: 'fractionPercent' })
export class FractionPercentPipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(fraction: number | null | undefined): string {
    return formatPercent(fraction, this.locale);
  }
}
