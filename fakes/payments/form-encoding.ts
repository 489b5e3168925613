/**
 * The provider's request encoding: `application/x-www-form-urlencoded` with bracketed keys for
 * nested hashes and arrays (`metadata[invoice]=12`, `expand[0]=latest_charge`,
 * `payment_method_data[card][number]=…`), as the `stripe` SDK writes it (its
 * `queryStringifyRequestData`: indexed arrays, brackets left unencoded) and as curl users write
 * it (`expand[]=…`). Parsed here rather than with a generic query-string library so that the
 * result has no prototype, reserved names are refused, and malformed keys give an API error.
 */

/** A decoded parameter: a string, a nested hash or an array. */
export type FormValue = string | FormHash | FormValue[];
/** A decoded hash of parameters (null prototype). */
export interface FormHash {
  [key: string]: FormValue;
}

/** A request whose parameters cannot be decoded; `param` names the offending key. */
export class FormEncodingError extends Error {
  constructor(
    message: string,
    readonly param: string,
  ) {
    super(message);
  }
}

const MAX_PARAMS = 1000;
const MAX_DEPTH = 8;
const RESERVED = new Set(['__proto__', 'constructor', 'prototype']);
const KEY_PATTERN = /^([^[\]]+)((?:\[[^[\]]*\])*)$/;

/** Hashes whose keys stay keys even when they look like indexes (metadata may use `metadata[1]`). */
const KEYED_HASHES = new Set(['metadata']);

function splitKey(rawKey: string): string[] {
  const match = KEY_PATTERN.exec(rawKey);
  if (!match) throw new FormEncodingError(`Invalid parameter name: ${rawKey}`, rawKey);
  const segments = [match[1]];
  for (const m of match[2].matchAll(/\[([^[\]]*)\]/g)) segments.push(m[1]);
  if (segments.length > MAX_DEPTH) throw new FormEncodingError(`Parameter nested too deeply: ${rawKey}`, rawKey);
  for (const s of segments) {
    if (RESERVED.has(s)) throw new FormEncodingError(`Invalid parameter name: ${rawKey}`, rawKey);
  }
  return segments;
}

function emptyHash(): FormHash {
  return Object.create(null) as FormHash;
}

/** Decodes a form-encoded body or query string into nested hashes and arrays. */
export function parseFormEncoded(text: string): FormHash {
  const root = emptyHash();
  if (!text) return root;
  let count = 0;
  for (const [rawKey, value] of new URLSearchParams(text)) {
    if (++count > MAX_PARAMS) throw new FormEncodingError(`Too many parameters (more than ${MAX_PARAMS})`, rawKey);
    const path = splitKey(rawKey);
    let node = root;
    for (let i = 0; i < path.length; i++) {
      // `key[]` appends: the next free index of the hash being built.
      const segment = path[i] === '' ? String(Object.keys(node).length) : path[i];
      const last = i === path.length - 1;
      const existing = node[segment];
      if (last) {
        if (existing !== undefined && typeof existing !== 'string') throw new FormEncodingError(`Invalid hash: ${rawKey}`, rawKey);
        node[segment] = value;
      } else {
        if (existing === undefined) node[segment] = emptyHash();
        else if (typeof existing === 'string') throw new FormEncodingError(`Invalid hash: ${rawKey}`, rawKey);
        node = node[segment] as FormHash;
      }
    }
  }
  return toArrays(root, '') as FormHash;
}

/** Turns hashes whose keys are all indexes into arrays (in index order), except keyed hashes. */
function toArrays(value: FormValue, key: string): FormValue {
  if (typeof value === 'string' || Array.isArray(value)) return value;
  const keys = Object.keys(value);
  for (const k of keys) value[k] = toArrays(value[k], k);
  if (!keys.length || KEYED_HASHES.has(key) || !keys.every((k) => /^\d+$/.test(k))) return value;
  return keys.sort((a, b) => Number(a) - Number(b)).map((k) => value[k]);
}
