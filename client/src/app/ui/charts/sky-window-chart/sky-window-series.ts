import type { NightDarkReport, TargetWindowsReport } from '@spincycle/shared/sky/sky-windows-report';

/** One night of the sky-window chart. */
export interface SkyWindowNight {
  nightDate: string;
  usableHours: number;
  /** Null when the report has no darkness for that night. */
  darkHours: number | null;
  /** Moon illuminated fraction, percent (0–100). */
  moonPercent: number | null;
  moonExcluded: boolean;
}

/**
 * The nights of one target's sky window, joined with the site's darkness and Moon by night
 * date. The target's own nights set the order; without them (a report requested without
 * nights) the site's nights are used with zero usable hours.
 */
export function skyWindowNights(target: TargetWindowsReport, nights: readonly NightDarkReport[]): SkyWindowNight[] {
  const dark = new Map(nights.map((night) => [night.nightDate, night]));
  if (!target.nights) {
    return nights.map((night) => ({
      nightDate: night.nightDate,
      usableHours: 0,
      darkHours: finiteOrNull(night.darkHours),
      moonPercent: percent(night.moonIllumination),
      moonExcluded: false,
    }));
  }
  return target.nights.map((night) => {
    const site = dark.get(night.nightDate);
    return {
      nightDate: night.nightDate,
      usableHours: Number.isFinite(night.usableHours) ? night.usableHours : 0,
      darkHours: site ? finiteOrNull(site.darkHours) : null,
      moonPercent: percent(site?.moonIllumination ?? night.moonIllumination),
      moonExcluded: night.moonExcluded === true,
    };
  });
}

/** The one-line verdict drawn from the summary alone (when no cadence assessment is given). */
export function summaryVerdict(target: TargetWindowsReport): string {
  const s = target.summary;
  const nights = (n: number) => `${n} night${n === 1 ? '' : 's'}`;
  if (s.usableNights === 0) return `never observable in the ${nights(s.totalNights)} of the campaign`;
  // Gap: nights without a usable night between two usable ones (0 = consecutive); none with one night.
  const gap = s.longestGapNights === null ? '' : s.longestGapNights === 0 ? '; no gap' : `; longest gap ${nights(s.longestGapNights)}`;
  return `observable on ${s.usableNights} of ${nights(s.totalNights)}${gap}`;
}

function finiteOrNull(value: number | undefined): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

function percent(fraction: number | undefined): number | null {
  const f = finiteOrNull(fraction);
  return f === null ? null : Math.round(f * 1000) / 10;
}
