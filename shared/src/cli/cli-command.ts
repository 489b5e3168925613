/**
 * The shape of one command of the `spincycle` command line, and the small helpers every
 * command uses to read its options (node:util `parseArgs`).
 */
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { ScienceInputError } from '../science/science-input-error';

/** One command: `spincycle <name> [options]`. */
export interface CliCommand {
  name: string;
  /** One line for the command list. */
  summary: string;
  /** Full usage text printed by `spincycle <name> --help`. */
  usage: string;
  /** Runs the command; the result is printed as JSON on stdout. */
  run(argv: string[]): Promise<unknown>;
}

/** A mistake in the command line itself (unknown option, missing value): exit code 2. */
export class CliUsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CliUsageError';
  }
}

type Options = NonNullable<ParseArgsConfig['options']>;

/** parseArgs with strict checking; its errors become {@link CliUsageError}. */
export function parseCommandArgs<O extends Options>(argv: string[], options: O, allowPositionals = false) {
  try {
    return parseArgs({ args: joinNegativeNumbers(argv, options), allowPositionals, options, strict: true });
  } catch (err) {
    throw new CliUsageError((err as Error).message);
  }
}

/**
 * `--age -5` → `--age=-5`: parseArgs takes a value starting with a dash for an option, but
 * a negative number after a string option is a value (so that the science core can say
 * what is wrong with it).
 */
function joinNegativeNumbers(argv: string[], options: Options): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const next = argv[i + 1];
    const name = a.startsWith('--') && !a.includes('=') ? a.slice(2) : null;
    if (name && options[name]?.type === 'string' && next !== undefined && /^-(\d|\.\d)/.test(next)) {
      out.push(`${a}=${next}`);
      i++;
    } else {
      out.push(a);
    }
  }
  return out;
}

/**
 * Reads a numeric option. Missing: `undefined` (or a usage error when `required`); not a
 * number: a ScienceInputError naming the science field (e.g. `ageMyr`).
 */
export function numberOption(raw: string | undefined, option: string, field: string, required = false): number | undefined {
  if (raw === undefined) {
    if (required) throw new CliUsageError(`missing --${option} (${field})`);
    return undefined;
  }
  const v = Number(raw.trim());
  if (raw.trim() === '' || !Number.isFinite(v)) throw new ScienceInputError(field, `must be a number (got "${raw}")`);
  return v;
}

/** Reads `--bv X` or `--bprp X` (exactly one). */
export function colourOption(values: { bv?: string; bprp?: string }): { value: number; system: 'BV' | 'BPRP' } {
  if (values.bv !== undefined && values.bprp !== undefined) throw new CliUsageError('give either --bv or --bprp, not both');
  if (values.bv !== undefined) return { value: numberOption(values.bv, 'bv', 'colour.value') as number, system: 'BV' };
  if (values.bprp !== undefined) return { value: numberOption(values.bprp, 'bprp', 'colour.value') as number, system: 'BPRP' };
  throw new CliUsageError('missing colour: give --bv (B−V) or --bprp (Gaia BP−RP)');
}

const RELATION_ALIASES: Record<string, string> = {
  barnes: 'barnes2007',
  barnes2007: 'barnes2007',
  mh2008: 'mamajekHillenbrand2008',
  mamajek: 'mamajekHillenbrand2008',
  mamajekhillenbrand2008: 'mamajekHillenbrand2008',
  angus2015: 'angus2015',
  angus2019: 'angus2019',
};

/** Relation id from a name or alias (case-insensitive); unknown names pass through for the science core to reject. */
export function relationOption(raw: string | undefined): string | undefined {
  if (raw === undefined) return undefined;
  return RELATION_ALIASES[raw.toLowerCase()] ?? raw;
}

/** Options shared by the colour-based commands, for parseArgs. */
export const COLOUR_OPTIONS = {
  bv: { type: 'string' },
  bprp: { type: 'string' },
  ebv: { type: 'string' },
  relation: { type: 'string' },
  help: { type: 'boolean', short: 'h' },
} as const;
