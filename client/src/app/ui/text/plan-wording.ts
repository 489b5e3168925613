/**
 * Plain language for the science core's explanations. The core writes its "why" lines and
 * sources for the people who maintain it (provenance notes such as "from memory" or
 * "Spincycle's choice, no source", code names such as `maxExposure`, citation keys such as
 * `young1967`); a proposer sees what a scientist recognises instead:
 * - a published relation, with a readable reference;
 * - a parameter of the node (its own configuration or rate card);
 * - an assumption of this product, said plainly;
 * - the proposer's own input;
 * - a calculation from the numbers above it (a definition, arithmetic).
 * Pure functions; used by the target planner and suitable for any screen that shows a plan.
 */
import type { Explained, ScienceFlag, SourceTag } from '@spincycle/shared/science/explained';
import { GYRO_RELATION_INFO, GYRO_RELATIONS } from '@spincycle/shared/science/gyrochronology';
import { TURNOVER_SCALE_INFO, TURNOVER_SCALES } from '@spincycle/shared/science/turnover-time';

/** Where a number comes from, as the page says it. */
export type ProvenanceKind = 'published' | 'facility' | 'assumption' | 'input' | 'calculation';

export const PROVENANCE_LABELS: Readonly<Record<ProvenanceKind, string>> = {
  published: 'Published relation',
  facility: 'Node parameter',
  assumption: 'Spincycle assumption',
  input: 'Your input',
  calculation: 'Calculation',
};

export const PROVENANCE_DESCRIPTIONS: Readonly<Record<ProvenanceKind, string>> = {
  published: 'A relation or model from the literature; the reference is given.',
  facility: 'A value from the node’s own configuration, site or rate card.',
  assumption: 'A planning assumption of Spincycle or a common observing rule, not taken from a publication.',
  input: 'A value you entered (or its default).',
  calculation: 'Arithmetic on the numbers above it, or a definition.',
};

/** The provenance of one explained number. */
export interface Provenance {
  kind: ProvenanceKind;
  label: string;
  description: string;
  /** The source, readable: a reference, a node parameter or an assumption in words. */
  reference: string;
}

/** Citation keys of the core (relation, τ scale and scintillation model ids) → readable references. */
const CITATION_KEYS: ReadonlyMap<string, string> = new Map<string, string>([
  ...GYRO_RELATIONS.map((id) => [id, GYRO_RELATION_INFO[id].label] as const),
  ...TURNOVER_SCALES.map((id) => [id, TURNOVER_SCALE_INFO[id].label] as const),
  ['young1967', 'Young (1967)'],
  ['osborn2015', 'Osborn et al. (2015)'],
]);

/** Code names of the exposure step's limits and node fields → words. */
const CODE_WORDS: readonly [RegExp, string][] = [
  [/\b(limited|capped) by maxExposure\b/g, "$1 by the node's longest exposure"],
  [/\b(limited|capped) by minExposure\b/g, "$1 by the node's shortest exposure"],
  [/\b(limited|capped) by targetPrecision\b/g, '$1 by the precision goal'],
  [/\b(limited|capped) by saturation\b(?! of the star)/g, '$1 by saturation of the star'],
  [/\bmaxExposureSeconds\b|\bmaxExposure\b/g, "the node's longest exposure"],
  [/\bminExposureSeconds\b|\bminExposure\b/g, "the node's shortest exposure"],
  [/\bthe node saturationE\b/g, "the node's saturation level"],
  [/\bsaturationE\b/g, 'saturation level'],
  [/\bweatherLossFraction\b/g, 'weather loss'],
  [/\bR_per\b/g, 'Rₚₑᵣ'],
  [/\brateMinorPerHour\b/g, 'hourly rate'],
];

/** Provenance notes meant for maintainers → plain words, or nothing. */
const NOTES: readonly [RegExp, string][] = [
  [/\s*\((?:equation number(?: and formula)?|all|both|table values?) from memory\)/gi, ''],
  [/\s*\(from memory\)/gi, ''],
  [/,\s*from memory(?=[);,]|$)/gi, ''],
  [/;\s*from memory(?=[);,]|$)/gi, ''],
  [/\s*\[derived here\]/gi, ''],
  [/\s*\[derived\]/gi, ''],
  [/\s*\(Spincycle['’]s choice, no source\)/gi, ' (an assumption of Spincycle)'],
  [/Spincycle['’]s choice, no source/gi, 'an assumption of Spincycle'],
  [/\s*\(Spincycle['’]s (?:choice|model)\)/gi, ' (an assumption of Spincycle)'],
  [/Spincycle['’]s choice/gi, 'an assumption of Spincycle'],
  [/Spincycle['’]s rule/gi, 'an assumption of Spincycle'],
  [/\s*\(common practice, no (?:single )?source\)/gi, ' (common observing practice)'],
  [/common practice, no (?:single )?source/gi, 'common observing practice'],
  [/;\s*common practice(?=[);]|$)/gi, '; common observing practice'],
  [/\bthe proposal['’]s setting\b/gi, 'your input'],
  [/\bthe proposer['’]s value\b/gi, 'your input'],
  [/\bthe proposer['’]s period\b/gi, 'your period'],
  [/\bthe user['’]s choice\b/gi, 'your choice'],
  [/\bchosen by the user\b/gi, 'your choice'],
];

function replaceCitationKeys(text: string): string {
  return text.replace(/\b([a-z]+(?:[A-Z][a-z]+)*)(\d{4})\b/g, (match) => CITATION_KEYS.get(match) ?? match);
}

/** Developer wording of a why line, flag message or source made plain; whitespace tidied. */
export function plainText(text: string): string {
  let s = text;
  for (const [pattern, words] of NOTES) s = s.replace(pattern, words);
  for (const [pattern, words] of CODE_WORDS) s = s.replace(pattern, words);
  s = replaceCitationKeys(s);
  return s
    .replace(/\(\s*\)/g, '')
    .replace(/\s+([,;.)])/g, '$1')
    .replace(/\(\s+/g, '(')
    .replace(/\s{2,}/g, ' ')
    .replace(/;\s*;/g, ';')
    .trim();
}

/** The first letter capitalised when it is a Latin lower-case letter (never σ → Σ, λ → Λ). */
function capitalise(s: string): string {
  return /^[a-z]/.test(s) ? s[0].toUpperCase() + s.slice(1) : s;
}

/** A capitalised sentence with a full stop, in plain words. */
export function plainSentence(text: string): string {
  // A provenance note has no place inside a sentence said to the proposer (sources say it).
  const s = plainText(text)
    .replace(/\s*\((?:common observing practice|an assumption of Spincycle)\)/g, '')
    .trim();
  if (!s) return s;
  const capital = capitalise(s);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}

/** A citation in the text: "Author (2019)", "Author et al. 2015", "Author & Other (1991)". */
const CITATION = /[A-Z][A-Za-zÀ-ÿ'’-]+(?: et al\.| & [A-Z][A-Za-zÀ-ÿ'’-]+)?,? \(?(1[89]|20)\d{2}\)?/;
/** Sources that name the user's input. */
const INPUT_SOURCE =
  /\b(your input|your period|the proposer['’]s value|the user['’]s choice|the proposal['’]s setting|the target colour)\b/i;
/** Sources that are a definition or plain arithmetic. */
const DEFINITION_SOURCE = /^(definition of|ro = p\/τc$)/i;

/** The kind of source of an explained number (see the module comment). */
export function provenanceKind(source: string, tag: SourceTag): ProvenanceKind {
  const s = source.trim();
  if (INPUT_SOURCE.test(s) && !CITATION.test(s)) return 'input';
  switch (tag) {
    case 'facility':
      return 'facility';
    case 'paper':
    case 'memory':
    case 'derived':
      if (CITATION.test(s)) return 'published';
      return DEFINITION_SOURCE.test(s) || tag === 'derived' ? 'calculation' : 'published';
    case 'practice':
      return DEFINITION_SOURCE.test(s) ? 'calculation' : 'assumption';
    case 'choice':
    default:
      return 'assumption';
  }
}

/** The reference of a source in plain words (a bare assumption said as one). */
export function plainReference(source: string, kind: ProvenanceKind): string {
  const s = plainText(source);
  if (kind === 'assumption' && /^an assumption of Spincycle$/i.test(s)) return 'An assumption of Spincycle, not taken from a publication';
  if (kind === 'assumption' && /^common observing practice$/i.test(s)) return 'Common observing practice, not a single publication';
  if (kind === 'input' && /^(your input|your choice|the target colour)$/i.test(s)) return 'The value you entered';
  return capitalise(s);
}

/** Where an explained number comes from, in plain words. */
export function provenanceOf(q: Pick<Explained<unknown>, 'source' | 'tag'>): Provenance {
  const kind = provenanceKind(q.source, q.tag);
  return { kind, label: PROVENANCE_LABELS[kind], description: PROVENANCE_DESCRIPTIONS[kind], reference: plainReference(q.source, kind) };
}

/** A science flag with its message and source in plain words (message as a sentence). */
export function plainFlag(flag: ScienceFlag): ScienceFlag {
  const out: ScienceFlag = { ...flag, message: plainSentence(flag.message) };
  if (flag.source !== undefined) out.source = plainReference(flag.source, provenanceKind(flag.source, 'derived'));
  return out;
}
