import { inject, LOCALE_ID, Pipe, PipeTransform } from '@angular/core';
import { formatLatitude, formatLongitude } from './format-units';

/** `{{ site.latitudeDeg | coordinate: 'latitude' }}` → `28.761° N`. */
@Pipe({ name: 'coordinate' })
export class CoordinatePipe implements PipeTransform {
  private readonly locale = inject(LOCALE_ID);

  transform(valueDeg: number | null | undefined, axis: 'latitude' | 'longitude', fractionDigits = 3): string {
    if (valueDeg === null || valueDeg === undefined) return '';
    return axis === 'latitude'
      ? formatLatitude(valueDeg, this.locale, fractionDigits)
      : formatLongitude(valueDeg, this.locale, fractionDigits);
  }
}
