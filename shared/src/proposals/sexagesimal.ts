/**
 * Sexagesimal display of J2000 positions (the inverse of the sky module's parser, for tables
 * and printed summaries): RA in hours `hh:mm:ss.s`, Dec in degrees `±dd:mm:ss`.
 */

/** Right ascension in degrees → `hh:mm:ss.s` (0.1 s of time). */
export function formatRaHms(raDeg: number): string {
  let tenths = Math.round(((((raDeg % 360) + 360) % 360) / 15) * 36000);
  if (tenths >= 24 * 36000) tenths -= 24 * 36000;
  const h = Math.floor(tenths / 36000);
  const m = Math.floor((tenths % 36000) / 600);
  const s = (tenths % 600) / 10;
  return `${pad(h)}:${pad(m)}:${s.toFixed(1).padStart(4, '0')}`;
}

/** Declination in degrees → `±dd:mm:ss` (1″). */
export function formatDecDms(decDeg: number): string {
  const sign = decDeg < 0 ? '−' : '+';
  const total = Math.round(Math.abs(decDeg) * 3600);
  const d = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  return `${sign}${pad(d)}:${pad(m)}:${pad(s)}`;
}

const pad = (n: number) => String(n).padStart(2, '0');
