/**
 * The one way messages about numbers are worded, on the server and in the client: a true minus
 * sign (U+2212), ranges as "between −2 and 22 mag" with the unit, and the value the person
 * typed echoed as "(you typed 40)" — never a number the program derived from it (a converted
 * band, a de-reddened colour).
 */

/** Longest echo of a typed text, characters (a pasted paragraph is cut, not repeated). */
const MAX_ECHO_CHARS = 40;

/** A number written for people: true minus sign, at most 6 decimals, no trailing zeros. */
export function displayNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const rounded = Math.round(value * 1e6) / 1e6;
  const text = String(rounded === 0 ? 0 : rounded);
  return text.startsWith('-') ? `\u2212${text.slice(1)}` : text;
}

/** "between −2 and 22 mag", "between 0° and 360°": the one range notation. */
export function between(min: number, max: number, unit = ''): string {
  if (unit === '°') return `between ${displayNumber(min)}° and ${displayNumber(max)}°`;
  return `between ${displayNumber(min)} and ${displayNumber(max)}${unit ? ` ${unit}` : ''}`;
}

/**
 * What the person typed, as they typed it: a number with a true minus sign, a text trimmed and
 * cut to 40 characters; `empty` for an empty text.
 */
export function typedText(input: unknown): string {
  if (typeof input === 'number') return displayNumber(input);
  if (typeof input === 'string') {
    const t = input.trim();
    if (t === '') return 'nothing';
    const minus = /^-\d|^-\.\d/.test(t) ? `\u2212${t.slice(1)}` : t;
    return minus.length > MAX_ECHO_CHARS ? `${minus.slice(0, MAX_ECHO_CHARS)}…` : minus;
  }
  if (input === null || input === undefined) return 'nothing';
  if (typeof input === 'boolean') return String(input);
  return Array.isArray(input) ? 'a list' : 'an object';
}

const TYPED_SUFFIX = / \(you typed [^)]*\)\.$/;

/** "Enter a magnitude between −2 and 22 mag (you typed 40)." from the sentence without its full stop. */
export function withTyped(sentence: string, input: unknown): string {
  return `${sentence} (you typed ${typedText(input)}).`;
}

/**
 * The same message with another echo: the CSV reader puts the cell's own text there (what the
 * person typed is "4e1", not the 40 the schema saw). A message without an echo gets one.
 */
export function replaceTyped(message: string, typed: string): string {
  const base = TYPED_SUFFIX.test(message) ? message.replace(TYPED_SUFFIX, '') : message.replace(/\.$/, '');
  return withTyped(base, typed);
}
