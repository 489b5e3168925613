import { z } from 'zod';

/*
 * Text at the edge. PostgreSQL cannot store NUL (U+0000) in a text column at all (the insert
 * fails with a 500), and other control characters or bidirectional overrides in names end up in
 * exports, file names, mail subjects and terminal output where they hide or reorder what a reader
 * sees. So: names and other one-line fields allow no control characters and no bidirectional
 * embedding/override/isolate characters; multi-line fields (abstracts, notes) also allow tab,
 * line feed and carriage return. Nothing is removed silently: the request is refused with a 400
 * naming the field, so what is stored is what the person typed.
 */

// eslint-disable-next-line no-control-regex
const CONTROL_ONE_LINE = /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/u;
// eslint-disable-next-line no-control-regex
const CONTROL_MULTI_LINE = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/u;
// eslint-disable-next-line no-control-regex
const CONTROL_ANY = /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/gu;

/** Message of a refused one-line text. */
export const CONTROL_CHARACTER_MESSAGE = 'must not contain control characters (such as NUL, line breaks or direction overrides)';
/** Message of a refused multi-line text. */
export const CONTROL_CHARACTER_MULTILINE_MESSAGE = 'must not contain control characters other than tab and line breaks';

/** True when a one-line text holds a control or bidirectional-override character. */
export function hasControlCharacters(text: string): boolean {
  return CONTROL_ONE_LINE.test(text);
}

/** True when a multi-line text holds a control character other than tab, CR and LF. */
export function hasMultiLineControlCharacters(text: string): boolean {
  return CONTROL_MULTI_LINE.test(text);
}

/** The text without control and bidirectional-override characters (for values written out: exports, file names). */
export function stripControlCharacters(text: string): string {
  return text.replace(CONTROL_ANY, '');
}

/**
 * A one-line text field: refuses control characters and direction overrides. Chain length
 * rules before it (`safeText(z.string().trim().min(1).max(80))`); the result is still a
 * ZodString, so forms can use it as a field validator.
 */
export function safeText<T extends z.ZodString>(schema: T): T {
  return schema.refine((s) => !hasControlCharacters(s), { message: CONTROL_CHARACTER_MESSAGE }) as T;
}

/** A multi-line text field: like safeText, but tab, line feed and carriage return are allowed. */
export function safeMultiLineText<T extends z.ZodString>(schema: T): T {
  return schema.refine((s) => !hasMultiLineControlCharacters(s), { message: CONTROL_CHARACTER_MULTILINE_MESSAGE }) as T;
}

/** Dotted paths of every string inside a parsed value that holds a NUL character. */
export function pathsWithNul(value: unknown, path: (string | number)[] = []): (string | number)[][] {
  if (typeof value === 'string') return value.includes('\u0000') ? [path] : [];
  if (Array.isArray(value)) return value.flatMap((v, i) => pathsWithNul(v, [...path, i]));
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => pathsWithNul(v, [...path, k]));
  return [];
}

/**
 * A check for `.superRefine` on schemas whose text fields are not built with safeText: adds an
 * issue naming every field that holds a NUL character (which PostgreSQL cannot store).
 */
export function refuseNul(value: unknown, ctx: z.RefinementCtx): void {
  for (const path of pathsWithNul(value)) ctx.addIssue({ code: 'custom', path, message: 'must not contain NUL characters' });
}
