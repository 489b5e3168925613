import { PROPOSAL_STATE_LABELS, PROPOSAL_STATES, type ProposalState } from '@spincycle/shared/proposals/proposal-states';
import {
  AWARD_OUTCOME_LABELS,
  AWARD_OUTCOMES,
  PROGRAM_STATE_LABELS,
  PROGRAM_STATES,
  type AuditEntry,
  type AwardOutcome,
  type ProgramState,
} from '@spincycle/shared/awards/awards';
import { formatHours } from '../../../ui/units/format-units';

/** Node codes by id, to name the nodes of a decision. */
export type NodeCodes = ReadonlyMap<number, string>;

/** What an entry did, in words, by the kind of thing it changed. Unknown actions are written out from their key. */
const ACTIONS: Record<AuditEntry['entity'], Record<string, string>> = {
  award: {
    decided: 'Decided',
    changed: 'Changed the decision',
    released: 'Released to the team',
  },
  release: { released: 'Released the decisions' },
  program: {
    created: 'Created the program',
    reinstated: 'Reinstated the program',
    withdrawn: 'Withdrew the program',
    observing: 'The program started observing',
    complete: 'The program is complete',
    rate_class: 'Changed the rate the program pays',
  },
  night_plan: { build: 'Built the night plans' },
  lost_night: { mark_lost: 'Marked a night lost', unmark_lost: 'Marked a night usable again' },
  visit: { set_status: 'Changed a visit', execution_upload: 'Uploaded an execution log' },
  calendar_feed: {
    make_link: 'Made a calendar subscription link',
    replace_link: 'Made a new calendar subscription link (the previous one stopped working)',
    stop_link: 'Stopped a calendar subscription link',
  },
  invoice: {
    issued: 'Issued an invoice',
    voided: 'Voided an invoice',
    paid: 'The card payment of an invoice arrived',
    refund_requested: 'Asked for a refund of an invoice',
    refunded: 'The refund of an invoice was confirmed',
    payment_unexpected: 'A card payment arrived that the invoice did not expect',
  },
};

/** `mailFailures` → `mail failures`; `program_state` → `program state`. */
function keyInWords(key: string): string {
  return key
    .replace(/_/g, ' ')
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase();
}

function sentenceCase(text: string): string {
  return text ? text[0].toUpperCase() + text.slice(1) : text;
}

/** The action of an entry in plain words. */
export function auditActionText(entry: Pick<AuditEntry, 'action' | 'entity'>): string {
  return ACTIONS[entry.entity]?.[entry.action] ?? sentenceCase(keyInWords(entry.action));
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function nodeHoursText(value: unknown, codes: NodeCodes, locale: string): string | null {
  if (!Array.isArray(value)) return null;
  const parts = value.filter(isRecord).map((n) => {
    const code = typeof n['nodeId'] === 'number' ? (codes.get(n['nodeId']) ?? `node ${n['nodeId']}`) : 'a node';
    const hours = typeof n['nodeHours'] === 'number' ? formatHours(n['nodeHours'], locale) : '? h';
    return `${hours} on ${code}`;
  });
  return parts.length ? parts.join(', ') : null;
}

/**
 * A stored value of the audit log (a decision, a release's counts, a program's state) in plain
 * words: `Awarded: 120 h on NODE-A (3 targets)`, `Scheduled`, `mailed 4; mail failures 0`.
 */
export function auditValueText(value: unknown, codes: NodeCodes, locale: string): string {
  if (value === null || value === undefined) return 'nothing';
  if (typeof value === 'string') {
    if ((AWARD_OUTCOMES as readonly string[]).includes(value)) return AWARD_OUTCOME_LABELS[value as AwardOutcome];
    if ((PROGRAM_STATES as readonly string[]).includes(value)) return PROGRAM_STATE_LABELS[value as ProgramState];
    return value;
  }
  if (typeof value === 'number') return new Intl.NumberFormat(locale).format(value);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return value.map((v) => auditValueText(v, codes, locale)).join(', ') || 'none';
  if (!isRecord(value)) return String(value);

  const outcome = value['outcome'];
  if (typeof outcome === 'string' && (AWARD_OUTCOMES as readonly string[]).includes(outcome)) {
    let text = AWARD_OUTCOME_LABELS[outcome as AwardOutcome];
    const hours = nodeHoursText(value['nodes'], codes, locale);
    if (hours) text += `: ${hours}`;
    const targets = value['targetIds'];
    if (Array.isArray(targets)) text += ` (${targets.length} ${targets.length === 1 ? 'target' : 'targets'} only)`;
    return text;
  }
  const state = value['state'];
  if (typeof state === 'string' && (PROGRAM_STATES as readonly string[]).includes(state)) {
    return `Program ${PROGRAM_STATE_LABELS[state as ProgramState].toLowerCase()}`;
  }
  const proposalState = value['proposalState'];
  if (typeof proposalState === 'string' && (PROPOSAL_STATES as readonly string[]).includes(proposalState)) {
    const program = value['program'];
    const programText =
      typeof program === 'string' && (PROGRAM_STATES as readonly string[]).includes(program)
        ? `; program ${PROGRAM_STATE_LABELS[program as ProgramState].toLowerCase()}`
        : '';
    return `Proposal ${PROPOSAL_STATE_LABELS[proposalState as ProposalState].toLowerCase()}${programText}`;
  }
  if (['awarded', 'reserve', 'notAwarded'].every((k) => typeof value[k] === 'number')) {
    const n = (k: string) => Number(value[k]);
    const programs = typeof value['programsCreated'] === 'number' ? n('programsCreated') : null;
    return (
      `${n('awarded')} awarded, ${n('reserve')} on reserve, ${n('notAwarded')} not awarded` +
      (programs === null ? '' : `; ${programs} ${programs === 1 ? 'program' : 'programs'} created`)
    );
  }
  const parts = Object.entries(value)
    .filter(([key]) => key !== 'version' && key !== 'id')
    .map(([key, v]) => `${keyInWords(key)} ${auditValueText(v, codes, locale)}`);
  return parts.length ? sentenceCase(parts.join('; ')) : 'nothing';
}
