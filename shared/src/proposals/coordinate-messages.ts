/**
 * The sky parser's reasons for refusing a typed right ascension or declination
 * (`sky/ra-dec-parser.ts`, which speaks in its own terms: "declination must be within
 * −90…+90°, got 95°") said in the product's one voice with the text as typed:
 * "Enter a declination between −90° and 90° (you typed 95.2)."
 */
import { between, withTyped } from '../http/range-text';

export type CoordinateKind = 'ra' | 'dec';

const NOUN: Record<CoordinateKind, string> = { ra: 'right ascension', dec: 'declination' };

const FORMATS: Record<CoordinateKind, string> = {
  ra: 'degrees (187.5), hours (12.5h) or sexagesimal hours (12:30:00)',
  dec: 'degrees (−5.34) or sexagesimal degrees (−05:20:30)',
};

/** The message for a coordinate the parser refused with `reason`; `typed` is the text as typed. */
export function coordinateMessage(kind: CoordinateKind, reason: string, typed: string): string {
  if (typed.trim() === '' || /^is (empty|missing)$/.test(reason)) return `Enter the ${NOUN[kind]}.`;
  if (kind === 'ra' && /must be below (24 h|360°)|cannot be negative/.test(reason)) {
    return withTyped(`Enter a right ascension ${between(0, 24, 'h')} or ${between(0, 360, '°')}`, typed);
  }
  if (kind === 'dec' && /must be (within|between)/.test(reason)) return withTyped(`Enter a declination ${between(-90, 90, '°')}`, typed);
  const part = /^(minutes|seconds) must be below 60/.exec(reason);
  if (part) return withTyped(`Keep the ${part[1]} of the ${NOUN[kind]} below 60`, typed);
  if (/cannot be given in hours/.test(reason)) return withTyped('Give the declination in degrees, not hours', typed);
  return withTyped(`Write the ${NOUN[kind]} as ${FORMATS[kind]}`, typed);
}
