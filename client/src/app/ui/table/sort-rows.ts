import type { Sort } from '@angular/material/sort';

export type SortValue = string | number | boolean | null | undefined;

/**
 * A sorted copy of `rows` for a MatSort state, reading each column through `valueOf`.
 * Numbers compare as numbers, text with the locale's numeric collation ("N2" before "N10");
 * empty values go last in both directions.
 */
export function sortRows<T>(rows: readonly T[], sort: Sort, valueOf: (row: T, column: string) => SortValue): T[] {
  if (!sort.active || sort.direction === '') return [...rows];
  const factor = sort.direction === 'asc' ? 1 : -1;
  const collator = new Intl.Collator(undefined, { numeric: true, sensitivity: 'base' });
  return [...rows].sort((a, b) => {
    const x = valueOf(a, sort.active);
    const y = valueOf(b, sort.active);
    if (x === y) return 0;
    if (x === null || x === undefined) return 1;
    if (y === null || y === undefined) return -1;
    if (typeof x === 'string' || typeof y === 'string') return factor * collator.compare(String(x), String(y));
    return factor * (Number(x) - Number(y));
  });
}
