import type { RequestHandler } from 'express';
import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { callStatusAt } from '@spincycle/shared/facility/facility-types';
import type { MemberRole } from '@spincycle/shared/proposals/proposal-schemas';
import { isEditableState, PROPOSAL_STATE_LABELS } from '@spincycle/shared/proposals/proposal-states';
import { idParamSchema } from '@spincycle/shared/http/ids';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { toCycleFromJson, type StoredCycle } from '../cycles/cycle-repository';
import { formatUtc } from '../cycles/cycle-service';
import { toProposal, type ProposalRow, type StoredProposal } from './proposal-repository';

/** A proposal as one of its team members reaches it. */
export interface ProposalAccess {
  proposal: StoredProposal;
  cycle: StoredCycle;
  role: MemberRole;
}

/**
 * The proposal and the viewer's part in it. Anyone who is not an active member of the team
 * (other proposers, reviewers, managers, administrators) gets the same 404 as for a proposal
 * that does not exist: its existence is not revealed. `forUpdate` locks the proposal row for
 * the rest of the transaction, so that edits, submission and withdrawal never interleave.
 * One query (proposal, cycle and the viewer's active membership): every proposal route runs it.
 */
export async function accessProposal(
  db: Knex,
  viewer: SessionUser,
  id: number,
  options: { forUpdate?: boolean } = {},
): Promise<ProposalAccess> {
  const q = db('proposals as p')
    .join('cycles as c', 'c.id', 'p.cycle_id')
    .leftJoin('proposal_members as m', (on) => {
      on.on('m.proposal_id', 'p.id')
        .andOn('m.account_id', db.raw('?', [viewer.id]))
        .andOnNotNull('m.accepted_at');
    })
    .where('p.id', id)
    .first('p.*', 'm.role as viewer_role', db.raw('row_to_json(c.*) AS cycle_row'));
  if (options.forUpdate) q.forUpdate('p');
  const row = (await q) as (ProposalRow & { viewer_role: MemberRole | null; cycle_row: Parameters<typeof toCycleFromJson>[0] }) | undefined;
  if (!row?.viewer_role) throw new AppError('proposal_not_found', `No proposal ${id}`, 404);
  return { proposal: toProposal(row), cycle: toCycleFromJson(row.cycle_row), role: row.viewer_role };
}

/** 403 `pi_only` unless the viewer is the proposal's PI. */
export function requirePi(access: ProposalAccess, action: string): void {
  if (access.role !== 'pi') throw new AppError('pi_only', `Only the PI can ${action}`, 403);
}

/** Whether the team may still change the proposal: a draft while its call is open. */
export function isEditable(access: Pick<ProposalAccess, 'proposal' | 'cycle'>, now: Date): boolean {
  return isEditableState(access.proposal.state) && callStatusAt(access.cycle, now) === 'open';
}

/**
 * 409 `not_editable` unless the proposal is a draft in an open call. Once submitted the
 * proposal is read-only (withdrawing it, while the call is open, makes it a draft again); once
 * the call closed, a draft can no longer be changed either.
 */
export function requireEditable(access: ProposalAccess, now: Date): void {
  const { proposal, cycle } = access;
  if (!isEditableState(proposal.state)) {
    const how = proposal.state === 'submitted' ? ' (withdraw it first, while the call is open)' : '';
    throw new AppError(
      'not_editable',
      `This proposal is ${PROPOSAL_STATE_LABELS[proposal.state].toLowerCase()} and can no longer be changed${how}`,
      409,
    );
  }
  const status = callStatusAt(cycle, now);
  if (status === 'closed') {
    throw new AppError(
      'not_editable',
      `The call for ${cycle.code} closed at ${formatUtc(cycle.callClosesAt)}; the proposal can no longer be changed`,
      409,
    );
  }
  if (status === 'upcoming') {
    throw new AppError(
      'not_editable',
      `The call for ${cycle.code} opens at ${formatUtc(cycle.callOpensAt)}; the proposal can be changed once it is open`,
      409,
    );
  }
}

/**
 * Middleware for the upload routes (justification PDF, target CSV), placed before the
 * multipart parser: the proposal must exist, the viewer must be on its team and it must be
 * editable, or the request is refused before a byte of the body is read. Why: the parser
 * buffers the file in memory (up to its limit) before the handler runs, so without this check
 * anyone signed in could make the server hold ten megabytes per request for a proposal they
 * cannot touch. A refused request closes its connection, so the client stops sending a body
 * that nobody reads. The services check again inside their transactions.
 */
export function requireEditableProposalBeforeUpload(ctx: AppContext): RequestHandler {
  return async (req, res, next) => {
    try {
      const { id } = idParamSchema.parse(req.params);
      requireEditable(await accessProposal(ctx.db, req.user!, id), ctx.now());
    } catch (err) {
      res.setHeader('Connection', 'close');
      throw err;
    }
    next();
  };
}
