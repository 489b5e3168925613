/**
 * Parses right ascension and declination as people type them:
 * - decimal degrees: `187.5`, `187.5d`, `187.5°`, `-5.3417`;
 * - decimal hours for RA: `12.5h`;
 * - sexagesimal, separated by colons, spaces or unit marks: `12:30:00`, `12 30 00.0`,
 *   `12h30m00s`, `-05:20:30`, `−05°20′30″`, `-05d20m30s`. Sexagesimal RA without marks is in
 *   hours (`12:30:00` = 187.5°), sexagesimal Dec in degrees. Only the last part may have decimals.
 * Unicode minus (U+2212), primes (′ ″) and typographic quotes are accepted.
 * Errors are `SkyInputError`s naming the field (`ra`/`dec`, with an optional prefix such as
 * `targets[3].`) and why.
 */
import { between, typedText } from '../http/range-text';
import { SkyInputError } from './sky-input-error';

/** A parsed position, J2000 degrees. */
export interface RaDecDeg {
  raDeg: number;
  decDeg: number;
}

type Marker = 'h' | 'd' | 'm' | 's' | ':' | '';

interface Part {
  value: number;
  text: string;
  marker: Marker;
}

const PART = /^(\d+(?:\.\d*)?|\.\d+)\s*(deg|h|d|°|m|'|s|"|:)?\s*/i;

function normalize(text: string): string {
  return text
    .trim()
    .replace(/[\u2212\u2012\u2013\u2014\uFE63\uFF0D]/g, '-')
    .replace(/[\u2032\u2019\u00B4]/g, "'")
    .replace(/[\u2033\u201D]/g, '"')
    .replace(/''/g, '"')
    .replace(/[\u00BA\u02DA]/g, '°');
}

function markerOf(raw: string | undefined): Marker {
  if (!raw) return '';
  const m = raw.toLowerCase();
  if (m === 'h') return 'h';
  if (m === 'd' || m === 'deg' || m === '°') return 'd';
  if (m === 'm' || m === "'") return 'm';
  if (m === 's' || m === '"') return 's';
  return ':';
}

/** Splits an unsigned coordinate into numeric parts with their unit marks. */
function splitParts(body: string, field: string, original: string): Part[] {
  const parts: Part[] = [];
  let rest = body;
  while (rest.length > 0) {
    const match = PART.exec(rest);
    if (!match) {
      throw new SkyInputError(field, `cannot read ${JSON.stringify(original)}: unexpected ${JSON.stringify(rest[0])}`);
    }
    parts.push({ value: Number(match[1]), text: match[1], marker: markerOf(match[2]) });
    rest = rest.slice(match[0].length);
  }
  if (parts.length === 0) throw new SkyInputError(field, 'is empty');
  if (parts.length > 3) {
    throw new SkyInputError(field, `cannot read ${JSON.stringify(original)}: more than three parts (degrees/hours, minutes, seconds)`);
  }
  return parts;
}

/** Reads a coordinate; returns its magnitude in `unit` and whether it was negative. */
function readAngle(text: unknown, field: string, kind: 'ra' | 'dec'): { magnitude: number; unit: 'h' | 'd'; negative: boolean } {
  if (typeof text === 'number') {
    if (!Number.isFinite(text)) throw new SkyInputError(field, `must be a finite number, got ${String(text)}`);
    return { magnitude: Math.abs(text), unit: 'd', negative: text < 0 };
  }
  if (typeof text !== 'string') throw new SkyInputError(field, 'is missing');
  const original = text;
  let body = normalize(text);
  if (body === '') throw new SkyInputError(field, 'is empty');
  let negative = false;
  if (body[0] === '-' || body[0] === '+') {
    negative = body[0] === '-';
    body = body.slice(1).trimStart();
  }
  const parts = splitParts(body, field, original);
  const first = parts[0];

  if (parts.length === 1) {
    if (first.marker === 'm' || first.marker === 's' || first.marker === ':') {
      throw new SkyInputError(field, `cannot read ${JSON.stringify(original)}: a single value must be degrees or hours`);
    }
    if (first.marker === 'h' && kind === 'dec') throw new SkyInputError(field, 'declination cannot be given in hours');
    return { magnitude: first.value, unit: first.marker === 'h' ? 'h' : 'd', negative };
  }

  // Sexagesimal.
  let unit: 'h' | 'd';
  if (first.marker === 'h') unit = 'h';
  else if (first.marker === 'd') unit = 'd';
  else if (first.marker === ':' || first.marker === '') unit = kind === 'ra' ? 'h' : 'd';
  else throw new SkyInputError(field, `cannot read ${JSON.stringify(original)}: the first part must be degrees or hours`);
  if (unit === 'h' && kind === 'dec') throw new SkyInputError(field, 'declination cannot be given in hours');

  const expected: Marker[][] = [[], ['m', ':', ''], ['s', '']];
  for (let i = 1; i < parts.length; i++) {
    if (!expected[i].includes(parts[i].marker)) {
      throw new SkyInputError(field, `cannot read ${JSON.stringify(original)}: unexpected unit after part ${i + 1}`);
    }
  }
  for (let i = 0; i < parts.length - 1; i++) {
    if (parts[i].text.includes('.')) {
      throw new SkyInputError(field, `cannot read ${JSON.stringify(original)}: only the last part may have decimals`);
    }
  }
  const minutes = parts[1].value;
  const seconds = parts.length > 2 ? parts[2].value : 0;
  if (minutes >= 60) throw new SkyInputError(field, `minutes must be below 60, got ${parts[1].text}`);
  if (seconds >= 60) throw new SkyInputError(field, `seconds must be below 60, got ${parts[2].text}`);
  return { magnitude: first.value + minutes / 60 + seconds / 3600, unit, negative };
}

/**
 * Parses a right ascension (see the file comment) into degrees in [0, 360). Range errors quote
 * the text as typed ("got 25:00:00"), never the hours or degrees read from it.
 */
export function parseRa(text: unknown, field = 'ra'): number {
  const { magnitude, unit, negative } = readAngle(text, field, 'ra');
  if (negative && magnitude !== 0) throw new SkyInputError(field, `right ascension cannot be negative, got ${typedText(text)}`);
  if (unit === 'h') {
    if (magnitude >= 24) throw new SkyInputError(field, `right ascension must be below 24 h, got ${typedText(text)}`);
    return magnitude * 15;
  }
  if (magnitude >= 360) throw new SkyInputError(field, `right ascension must be below 360°, got ${typedText(text)}`);
  return magnitude;
}

/**
 * Parses a declination (see the file comment) into degrees in [−90, +90]. The range error
 * quotes the text as typed ("got +95:12:00"), not the degrees read from it.
 */
export function parseDec(text: unknown, field = 'dec'): number {
  const { magnitude, negative } = readAngle(text, field, 'dec');
  if (magnitude > 90) throw new SkyInputError(field, `declination must be ${between(-90, 90, '°')}, got ${typedText(text)}`);
  return negative ? -magnitude : magnitude;
}

/**
 * Parses an RA/Dec pair. `fieldPrefix` is put before `ra`/`dec` in error fields
 * (e.g. `targets[3].` → `targets[3].ra`).
 */
export function parseRaDec(raText: unknown, decText: unknown, fieldPrefix = ''): RaDecDeg {
  return { raDeg: parseRa(raText, `${fieldPrefix}ra`), decDeg: parseDec(decText, `${fieldPrefix}dec`) };
}
