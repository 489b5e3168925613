import { signal } from '@angular/core';
import {
  awardInputSchema,
  type AwardBoardRow,
  type AwardDecision,
  type AwardInput,
  type AwardNodeCapacity,
  type AwardOutcome,
} from '@spincycle/shared/awards/awards';

/**
 * Where a row's decision stands on the page: as read (`idle`), edited and not saved (`dirty`),
 * on its way, saved just now, refused (`failed`), or replaced by someone else's newer decision
 * (`stale`: the row shows the stored decision again).
 */
export type DraftState = 'idle' | 'dirty' | 'saving' | 'saved' | 'failed' | 'stale';

/** The key under which a node's hours field shows its messages. */
export const nodeKey = (nodeId: number) => `node:${nodeId}`;

/** Hours with at most two decimals, as an input shows them. */
export function hoursText(hours: number): string {
  return String(Math.round(hours * 100) / 100);
}

/** The hours a decision gives on a node (0 when none). */
export function hoursOn(decision: Pick<AwardDecision, 'nodes'> | null, nodeId: number): number {
  return decision?.nodes.find((n) => n.nodeId === nodeId)?.nodeHours ?? 0;
}

/** Same targets, in any order (null = every target). */
export function sameTargets(a: number[] | null, b: number[] | null): boolean {
  if (a === null || b === null) return a === b;
  if (a.length !== b.length) return false;
  const set = new Set(a);
  return b.every((id) => set.has(id));
}

/**
 * The nodes a row's decision can give hours on: those the proposal requests, and any its
 * stored decision already uses, in the board's node order.
 */
export function rowNodes(row: AwardBoardRow, nodes: readonly AwardNodeCapacity[]): AwardNodeCapacity[] {
  const ids = new Set([...row.requests.map((r) => r.nodeId), ...(row.award?.nodes.map((n) => n.nodeId) ?? [])]);
  return nodes.filter((n) => ids.has(n.nodeId));
}

/**
 * The decision on one ranked proposal as the manager edits it: outcome, hours per node (the
 * text typed, so that an empty field differs from 0), and the targets of a partial award.
 * Field messages are kept by key: `outcome`, `targetIds`, `node:<id>`, and `row` for the rest.
 */
export class AwardDraft {
  /** The decision's version this draft was read from (0 before any decision). */
  baseVersion = 0;
  readonly outcome = signal<AwardOutcome | null>(null);
  readonly hours = signal<ReadonlyMap<number, string>>(new Map());
  /** Null: every target (an award or a reserve; not awarded names none). */
  readonly targetIds = signal<number[] | null>(null);
  readonly state = signal<DraftState>('idle');
  /** The sentence beside the Save button (saved, refused, replaced). */
  readonly message = signal<string | null>(null);
  readonly fieldErrors = signal<Readonly<Record<string, string>>>({});

  constructor(row: AwardBoardRow) {
    this.resetFrom(row);
  }

  /** Shows the stored decision of `row` again, dropping every edit and message. */
  resetFrom(row: AwardBoardRow): void {
    const award = row.award;
    this.baseVersion = award?.version ?? 0;
    this.outcome.set(award?.outcome ?? null);
    this.hours.set(new Map((award?.nodes ?? []).map((n) => [n.nodeId, hoursText(n.nodeHours)])));
    this.targetIds.set(award?.targetIds ?? null);
    this.state.set('idle');
    this.message.set(null);
    this.fieldErrors.set({});
  }

  /** True while the row holds edits that are not stored. */
  isUnsaved(): boolean {
    const s = this.state();
    return s === 'dirty' || s === 'saving' || s === 'failed';
  }

  /**
   * Picks an outcome. Choosing Awarded fills each empty hours field with what the proposal
   * asks on that node (what its saved targets need, when those are still the chosen ones).
   */
  chooseOutcome(outcome: AwardOutcome, row: AwardBoardRow, nodes: readonly AwardNodeCapacity[]): void {
    this.outcome.set(outcome);
    if (outcome === 'awarded') {
      const savedTargets = row.award && sameTargets(row.award.targetIds, this.targetIds());
      const next = new Map(this.hours());
      for (const node of rowNodes(row, nodes)) {
        if ((next.get(node.nodeId) ?? '').trim() !== '') continue;
        const request = row.requests.find((r) => r.nodeId === node.nodeId);
        const hours = request ? (savedTargets ? request.neededForAwardedTargets : request.requestedHours) : 0;
        if (hours > 0) next.set(node.nodeId, hoursText(hours));
      }
      this.hours.set(next);
    }
    this.edited('outcome');
  }

  setHours(nodeId: number, text: string): void {
    const next = new Map(this.hours());
    next.set(nodeId, text);
    this.hours.set(next);
    this.edited(nodeKey(nodeId));
  }

  setTargets(targetIds: number[] | null): void {
    this.targetIds.set(targetIds);
    this.edited('targetIds');
  }

  /** The hours typed on a node as a number (0 when empty or not a number). */
  hoursValue(nodeId: number): number {
    const text = (this.hours().get(nodeId) ?? '').trim();
    const value = text === '' ? 0 : Number(text);
    return Number.isFinite(value) && value > 0 ? value : 0;
  }

  private edited(field: string): void {
    this.state.set('dirty');
    this.message.set(null);
    const errors = { ...this.fieldErrors() };
    delete errors[field];
    delete errors['row'];
    this.fieldErrors.set(errors);
  }
}

/** What a draft sends, or the messages that stop it from being sent (keyed as the draft's fields). */
export type DraftRequest = { input: AwardInput; errors?: undefined } | { input?: undefined; errors: Record<string, string> };

/**
 * The body of PUT /api/awards/proposals/:id for a draft, checked with the shared schema so that
 * a field the server would refuse is named beside it before anything is sent. Reserve keeps
 * the hours (and targets) it would get if promoted; not awarded sends no node and no target.
 */
export function draftRequest(
  draft: AwardDraft,
  row: AwardBoardRow,
  nodes: readonly AwardNodeCapacity[],
  overrideReason: string | null = null,
): DraftRequest {
  const outcome = draft.outcome();
  if (outcome === null) return { errors: { outcome: 'Choose an outcome first.' } };
  const errors: Record<string, string> = {};
  const sent: { nodeId: number; nodeHours: number }[] = [];
  if (outcome !== 'not_awarded') {
    for (const node of rowNodes(row, nodes)) {
      const text = (draft.hours().get(node.nodeId) ?? '').trim();
      if (text === '') continue;
      const value = Number(text);
      if (!Number.isFinite(value) || value < 0) {
        errors[nodeKey(node.nodeId)] = 'Enter node-hours as a number, or leave it empty.';
      } else if (value > 0) {
        sent.push({ nodeId: node.nodeId, nodeHours: value });
      }
    }
    if (outcome === 'awarded' && sent.length === 0 && Object.keys(errors).length === 0) {
      errors['outcome'] = 'An award needs node-hours on at least one node.';
    }
  }
  const input: AwardInput = {
    version: draft.baseVersion,
    outcome,
    nodes: sent,
    targetIds: outcome === 'not_awarded' ? null : draft.targetIds(),
    overrideReason,
  };
  const parsed = awardInputSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const [field, index] = issue.path;
      if (field === 'nodes' && typeof index === 'number' && sent[index]) {
        errors[nodeKey(sent[index].nodeId)] ??= `Node-hours ${issue.message}.`;
      } else if (field === 'targetIds') {
        errors['targetIds'] ??= `The targets ${issue.message}.`;
      } else {
        errors['row'] ??= `${String(field ?? 'The decision')} ${issue.message}.`;
      }
    }
  }
  return Object.keys(errors).length ? { errors } : { input };
}

/**
 * The server's field messages (`nodes.0.nodeHours`, `targetIds`, …) keyed as the draft's
 * fields; `nodes.<i>` refers to the i-th node of the body that was sent.
 */
export function draftFieldErrors(fieldErrors: Record<string, string[]> | undefined, sent: AwardInput): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [path, messages] of Object.entries(fieldErrors ?? {})) {
    const [field, index] = path.split('.');
    let key = 'row';
    if (field === 'nodes' && index !== undefined && sent.nodes[Number(index)]) key = nodeKey(sent.nodes[Number(index)].nodeId);
    else if (field === 'outcome' || field === 'targetIds') key = field;
    else if (field === 'nodes') key = 'outcome';
    out[key] = out[key] ? `${out[key]} ${messages.join(' ')}` : messages.join(' ');
  }
  return out;
}

/** What one node keeps once a draft's decision counts, against what it offers. */
export interface NodeLeft {
  nodeId: number;
  code: string;
  offeredHours: number;
  /** Node-hours left unawarded on the node with this decision (negative past capacity). */
  leftHours: number;
}

/**
 * What the draft leaves on each of its nodes: the node's remaining hours on the board, plus
 * what this proposal's stored award takes there (it is replaced), minus the hours typed when
 * the draft awards. A reserve is counted as if promoted (the page says so).
 */
export function nodesLeft(draft: AwardDraft, row: AwardBoardRow, nodes: readonly AwardNodeCapacity[]): NodeLeft[] {
  const outcome = draft.outcome();
  const stored = row.award?.outcome === 'awarded' ? row.award : null;
  return rowNodes(row, nodes).map((node) => {
    const before = node.remainingHours + hoursOn(stored, node.nodeId);
    const taken = outcome === 'awarded' || outcome === 'reserve' ? draft.hoursValue(node.nodeId) : 0;
    return { nodeId: node.nodeId, code: node.code, offeredHours: node.offeredHours, leftHours: before - taken };
  });
}
