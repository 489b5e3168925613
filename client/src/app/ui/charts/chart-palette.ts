/**
 * Colours of Spincycle's charts: the colour-blind-safe qualitative palette of Okabe & Ito
 * (2008), "Color Universal Design" (DESIGN.md → Look), the colour of each gyrochronology
 * relation, and the neutral colours of axes and text for the light and dark schemes.
 */
import type { GyroRelationId } from '@spincycle/shared/science/gyrochronology';

/** Okabe & Ito (2008) palette without its black, which disappears on the dark scheme. */
export const OKABE_ITO = {
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

/** One colour per gyrochronology relation, the same in every chart that draws relations. */
export const RELATION_COLOURS: Readonly<Record<GyroRelationId, string>> = {
  barnes2007: OKABE_ITO.blue,
  mamajekHillenbrand2008: OKABE_ITO.orange,
  angus2015: OKABE_ITO.bluishGreen,
  angus2019: OKABE_ITO.reddishPurple,
};

/** `#RRGGBB` with an alpha, as `rgba()`. */
export function withAlpha(hex: string, alpha: number): string {
  const n = Number.parseInt(hex.slice(1), 16);
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
}

/** Text, grid and marker colours of one colour scheme (close to the theme's on-surface tones). */
export interface ChartTheme {
  text: string;
  mutedText: string;
  grid: string;
  /** Markers that must stand out from every series (the star being planned). */
  emphasis: string;
}

/** Chart colours for the light or the dark scheme. */
export function chartTheme(isDark: boolean): ChartTheme {
  return isDark
    ? { text: '#e4e1e9', mutedText: '#c6c5d0', grid: 'rgba(228, 225, 233, 0.14)', emphasis: '#ffffff' }
    : { text: '#1b1b21', mutedText: '#46464f', grid: 'rgba(27, 27, 33, 0.12)', emphasis: '#000000' };
}
