import { AWARD_OUTCOME_LABELS, type AwardOutcome } from '@spincycle/shared/awards/awards';
import type { Knex } from 'knex';
import type { AppContext } from '../../app-context';
import { enqueueMail } from '../../mail/outbox';
import { findAward, listNodeNames, listReviewComments, listTargetIds, listTargetNames, listTeamEmails } from './award-repository';

/** What the team's decision mail says (no reviewer identity, no committee note). */
export interface DecisionMailContent {
  proposalId: number;
  proposalTitle: string;
  cycleCode: string;
  cycleTitle: string;
  outcome: AwardOutcome;
  nodes: { code: string; name: string; nodeHours: number }[];
  /** Names of the targets of a partial award; null when every target is in it. */
  awardedTargets: string[] | null;
  /** In a fixed order; shown as "Reviewer 1", "Reviewer 2", … */
  comments: { strengths: string; weaknesses: string }[];
  /** True for a decision changed after the release. */
  changed: boolean;
}

/** "12.50 node-hours". */
export const formatNodeHours = (hours: number) => `${hours.toFixed(2)} node-hours`;

/** The comments with their anonymous labels, in the given order. */
export function anonymiseComments(comments: { strengths: string; weaknesses: string }[]) {
  return comments.map((c, i) => ({ reviewer: `Reviewer ${i + 1}`, strengths: c.strengths, weaknesses: c.weaknesses }));
}

/** Subject and plain text of the decision mail. */
export function writeDecisionMail(c: DecisionMailContent, publicUrl: string): { subject: string; text: string } {
  const outcome = AWARD_OUTCOME_LABELS[c.outcome];
  const lines = [
    'Hello,',
    '',
    c.changed
      ? `The decision on your proposal "${c.proposalTitle}" in cycle ${c.cycleCode} (${c.cycleTitle}) has changed.`
      : `The decisions of cycle ${c.cycleCode} (${c.cycleTitle}) have been released.`,
    '',
    `Proposal: ${c.proposalTitle}`,
    `Outcome: ${outcome}`,
  ];
  if (c.outcome === 'awarded') {
    lines.push('', 'Node-hours awarded:', ...c.nodes.map((n) => `- ${n.code} (${n.name}): ${formatNodeHours(n.nodeHours)}`));
  } else if (c.outcome === 'reserve') {
    lines.push('', 'Your proposal is on the reserve list: it may be awarded time if node-hours become free during the cycle.');
    if (c.nodes.length) {
      lines.push('Node-hours it would receive:', ...c.nodes.map((n) => `- ${n.code} (${n.name}): ${formatNodeHours(n.nodeHours)}`));
    }
  } else {
    lines.push('', 'Your proposal was not awarded time in this cycle.');
  }
  if (c.outcome !== 'not_awarded' && c.awardedTargets) {
    lines.push('', `This is a partial award, for ${c.awardedTargets.length} of your targets:`, ...c.awardedTargets.map((t) => `- ${t}`));
  }
  lines.push('', "Reviewers' comments:");
  if (!c.comments.length) lines.push('', 'No written comments were given.');
  for (const r of anonymiseComments(c.comments)) {
    lines.push('', r.reviewer, `Strengths: ${r.strengths || '(none given)'}`, `Weaknesses: ${r.weaknesses || '(none given)'}`);
  }
  lines.push(
    '',
    "The consortium's own allocation rules govern this decision and the use of any node-hours awarded.",
    '',
    `The decision on the web: ${publicUrl}/proposals/${c.proposalId}`,
  );
  return { subject: `Decision on your proposal in ${c.cycleCode}: ${outcome}`, text: lines.join('\n') };
}

/**
 * Writes the team's decision mail (to the PI and accepted members, at their account e-mail) to
 * the outbox, inside the transaction that makes or releases the decision, as that transaction
 * sees it; answers the outbox id (null when there is no award or nobody to mail). The award's
 * `mailed_at` is set when the mail is handed to the relay: right after the commit
 * (deliverMail), or by the worker's retries.
 */
export async function enqueueDecisionMail(
  ctx: AppContext,
  trx: Knex.Transaction,
  proposal: { id: number; title: string },
  cycle: { code: string; title: string },
  changed: boolean,
): Promise<number | null> {
  const award = await findAward(trx, proposal.id);
  if (!award) return null;
  const to = await listTeamEmails(trx, proposal.id);
  if (!to.length) return null;
  const names = await listNodeNames(
    trx,
    award.nodes.map((n) => n.nodeId),
  );
  const allTargets = award.targetIds ? await listTargetIds(trx, proposal.id) : [];
  const content: DecisionMailContent = {
    proposalId: proposal.id,
    proposalTitle: proposal.title,
    cycleCode: cycle.code,
    cycleTitle: cycle.title,
    outcome: award.outcome,
    nodes: award.nodes.map((n) => ({ ...names.get(n.nodeId)!, nodeHours: n.nodeHours })),
    awardedTargets: award.targetIds
      ? await listTargetNames(
          trx,
          award.targetIds.filter((id) => allTargets.includes(id)),
        )
      : null,
    comments: await listReviewComments(trx, proposal.id),
    changed,
  };
  return enqueueMail(trx, { to, ...writeDecisionMail(content, ctx.config.publicUrl) }, 'decision', {
    onSent: { mark: 'award_mailed', proposalId: proposal.id },
  });
}
