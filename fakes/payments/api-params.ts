import type { FormHash, FormValue } from './form-encoding';

/** The `error` member of an error answer, in the provider's shape. */
export interface ApiErrorBody {
  type: 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'api_error';
  code?: string;
  decline_code?: string;
  message: string;
  param?: string;
  doc_url?: string;
  charge?: string;
  payment_intent?: unknown;
  payment_method?: unknown;
}

/**
 * An error answer. `recorded`: whether an `Idempotency-Key` keeps it for replays. As the
 * provider documents, a result is kept only once the endpoint has begun executing: a request
 * refused while its parameters are checked (unknown, missing or malformed parameters, objects it
 * names that do not exist) is not kept, so the same key may be retried with corrected
 * parameters; a declined card or a refused state change is kept.
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody,
    readonly recorded: boolean,
  ) {
    super(body.message);
  }
}

/** Where the provider documents its error codes (`doc_url` of errors). */
export const DOCS = 'https://docs.stripe.com/error-codes';

/** 400 invalid_request_error for a parameter (not recorded for idempotent replays). */
export function invalidParam(message: string, param: string | undefined, code?: string): ApiError {
  return new ApiError(
    400,
    { type: 'invalid_request_error', code, message, param, doc_url: code ? `${DOCS}/${code.replaceAll('_', '-')}` : undefined },
    false,
  );
}

/** 400 invalid_request_error from the object's state (recorded for idempotent replays). */
export function invalidState(message: string, code = 'payment_intent_unexpected_state', param?: string): ApiError {
  return new ApiError(400, { type: 'invalid_request_error', code, message, param, doc_url: `${DOCS}/${code.replaceAll('_', '-')}` }, true);
}

/** 404 resource_missing for the object named in the path. */
export function notFound(kind: string, id: string): ApiError {
  return new ApiError(
    404,
    {
      type: 'invalid_request_error',
      code: 'resource_missing',
      message: `No such ${kind}: '${id}'`,
      param: 'id',
      doc_url: `${DOCS}/resource-missing`,
    },
    false,
  );
}

/** 400 resource_missing for an object named by a parameter. */
export function missingReference(kind: string, id: string, param: string): ApiError {
  return invalidParam(`No such ${kind}: '${id}'`, param, 'resource_missing');
}

/**
 * Typed reading of decoded parameters, with the provider's error messages for missing,
 * malformed and unknown ones. `prefix` is the path of a nested hash (`payment_method_data[card]`),
 * used in the names the errors give.
 */
export class Params {
  constructor(
    readonly hash: FormHash,
    private readonly prefix = '',
  ) {}

  /** The full name of a parameter as the client wrote it. */
  name(key: string): string {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    return this.hash[key] !== undefined;
  }

  /** Refuses any parameter not in `allowed` (the provider's `parameter_unknown`). */
  allowOnly(allowed: readonly string[]): void {
    for (const key of Object.keys(this.hash)) {
      if (!allowed.includes(key)) throw invalidParam(`Received unknown parameter: ${this.name(key)}`, this.name(key), 'parameter_unknown');
    }
  }

  private scalar(key: string): string | undefined {
    const v = this.hash[key];
    if (v === undefined) return undefined;
    if (typeof v !== 'string')
      throw invalidParam(`Invalid string: ${this.name(key)} must be a single value, not a hash or an array`, this.name(key));
    return v;
  }

  string(key: string, options: { required?: boolean; max?: number } = {}): string | undefined {
    const v = this.scalar(key);
    if (v === undefined) {
      if (options.required) throw invalidParam(`Missing required param: ${this.name(key)}.`, this.name(key), 'parameter_missing');
      return undefined;
    }
    if (options.max !== undefined && v.length > options.max)
      throw invalidParam(`Invalid string: ${this.name(key)} must be at most ${options.max} characters long`, this.name(key));
    return v;
  }

  /** A string that the provider also accepts as empty to clear the value (`description=`). */
  clearableString(key: string, max?: number): string | null | undefined {
    const v = this.string(key, { max });
    return v === '' ? null : v;
  }

  integer(key: string, options: { required?: boolean; min?: number } = {}): number | undefined {
    const v = this.scalar(key);
    if (v === undefined || v === '') {
      if (options.required) throw invalidParam(`Missing required param: ${this.name(key)}.`, this.name(key), 'parameter_missing');
      return undefined;
    }
    if (!/^-?\d+$/.test(v) || !Number.isSafeInteger(Number(v)))
      throw invalidParam(`Invalid integer: ${v}`, this.name(key), 'parameter_invalid_integer');
    const n = Number(v);
    if (options.min !== undefined && n < options.min)
      throw invalidParam(`This value must be greater than or equal to ${options.min}.`, this.name(key), 'parameter_invalid_integer');
    return n;
  }

  boolean(key: string): boolean | undefined {
    const v = this.scalar(key);
    if (v === undefined || v === '') return undefined;
    if (v !== 'true' && v !== 'false') throw invalidParam(`Invalid boolean: ${v}`, this.name(key));
    return v === 'true';
  }

  enumeration<T extends string>(key: string, values: readonly T[]): T | undefined {
    const v = this.string(key);
    if (v === undefined || v === '') return undefined;
    if (!(values as readonly string[]).includes(v))
      throw invalidParam(`Invalid ${this.name(key)}: must be one of ${values.join(', ')}`, this.name(key));
    return v as T;
  }

  /** A nested hash, or undefined; a string where a hash belongs is refused. */
  nested(key: string): Params | undefined {
    const v = this.hash[key];
    if (v === undefined) return undefined;
    if (typeof v === 'string') {
      if (v === '') return undefined;
      throw invalidParam(`Invalid hash: ${this.name(key)}`, this.name(key));
    }
    if (Array.isArray(v)) throw invalidParam(`Invalid hash: ${this.name(key)}`, this.name(key));
    return new Params(v, this.name(key));
  }

  /** An array of strings (`expand[0]=…`), or undefined. */
  strings(key: string): string[] | undefined {
    const v: FormValue | undefined = this.hash[key];
    if (v === undefined) return undefined;
    if (v === '') return [];
    if (!Array.isArray(v) || v.some((x) => typeof x !== 'string')) throw invalidParam(`Invalid array: ${this.name(key)}`, this.name(key));
    return v as string[];
  }

  /**
   * `metadata[key]=value` pairs with the provider's limits (50 keys, keys up to 40 characters,
   * values up to 500). An empty value means "remove this key" on updates; `metadata=` clears all.
   */
  metadata(key = 'metadata'): { set: Record<string, string>; unset: string[]; clearAll: boolean } | undefined {
    const v = this.hash[key];
    if (v === undefined) return undefined;
    if (v === '') return { set: {}, unset: [], clearAll: true };
    if (typeof v === 'string' || Array.isArray(v))
      throw invalidParam('Invalid metadata: must be a hash of keys and string values', this.name(key));
    const set: Record<string, string> = {};
    const unset: string[] = [];
    const entries = Object.entries(v);
    if (entries.length > 50) throw invalidParam('Invalid metadata: metadata can have at most 50 keys', this.name(key));
    for (const [k, value] of entries) {
      const name = `${this.name(key)}[${k}]`;
      if (typeof value !== 'string') throw invalidParam(`Invalid metadata: the value of ${name} must be a string`, name);
      if (k.length > 40) throw invalidParam(`Invalid metadata: keys must be at most 40 characters long (${name})`, name);
      if (value.length > 500) throw invalidParam(`Invalid metadata: values must be at most 500 characters long (${name})`, name);
      if (value === '') unset.push(k);
      else set[k] = value;
    }
    return { set, unset, clearAll: false };
  }
}

/** Applies a metadata change to stored metadata (a new object; plain keys only). */
export function applyMetadata(current: Record<string, string>, change: ReturnType<Params['metadata']>): Record<string, string> {
  if (!change) return current;
  const next: Record<string, string> = change.clearAll ? {} : { ...current };
  for (const k of change.unset) delete next[k];
  for (const [k, v] of Object.entries(change.set)) next[k] = v;
  return next;
}
