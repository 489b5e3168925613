import type { NodeRequest } from '@spincycle/shared/proposals/proposal-schemas';
import { formatMinorUnits } from '@spincycle/shared/proposals/money';
import type { OutgoingMail } from '../../../mail/mailer';
import { formatUtc } from '../../cycles/cycle-service';

/** The caution printed wherever a fee is shown (DESIGN.md, cautions). */
export const FEE_CAUTION =
  "Fees are computed from the consortium's published rate card and are an estimate until time is awarded and invoiced. " +
  "The consortium's own terms and local tax rules govern every fee and invoice.";

/** Per-currency total of a request (nodes may bill in different currencies). */
export function totalsByCurrency(request: NodeRequest[]): { currency: string; nodeHours: number; feeMinor: number }[] {
  const totals = new Map<string, { currency: string; nodeHours: number; feeMinor: number }>();
  for (const r of request) {
    const t = totals.get(r.currency) ?? { currency: r.currency, nodeHours: 0, feeMinor: 0 };
    t.nodeHours = Math.round((t.nodeHours + r.nodeHours) * 100) / 100;
    t.feeMinor += r.feeMinor;
    totals.set(r.currency, t);
  }
  return [...totals.values()];
}

const hours = (h: number) => `${h.toFixed(2)} node-hours`;

/** The receipt every active team member gets when the proposal is submitted. */
export function receiptMail(input: {
  to: string[];
  title: string;
  piName: string;
  cycle: { code: string; title: string; callClosesAt: string };
  submittedAt: string;
  targetCount: number;
  request: NodeRequest[];
}): OutgoingMail {
  const width = Math.max(5, ...input.request.map((r) => r.nodeCode.length));
  const lines = input.request.map((r) => {
    const note = r.infeasibleTargets ? `, ${r.infeasibleTargets} infeasible` : '';
    return `  ${r.nodeCode.padEnd(width)}  ${hours(r.nodeHours).padStart(20)}  ${formatMinorUnits(r.feeMinor, r.currency).padStart(16)}  (${r.targets} target plans${note})`;
  });
  const totals = totalsByCurrency(input.request).map(
    (t) => `  ${'Total'.padEnd(width)}  ${hours(t.nodeHours).padStart(20)}  ${formatMinorUnits(t.feeMinor, t.currency).padStart(16)}`,
  );
  return {
    to: input.to,
    subject: `Proposal submitted: “${input.title}” (${input.cycle.code})`,
    text: [
      'Hello,',
      '',
      `The proposal “${input.title}” has been submitted to the call for ${input.cycle.code}.`,
      '',
      `Title:         ${input.title}`,
      `PI:            ${input.piName}`,
      `Cycle:         ${input.cycle.code} (${input.cycle.title})`,
      `Submitted at:  ${formatUtc(input.submittedAt)}`,
      `Targets:       ${input.targetCount}`,
      '',
      'Time requested per node:',
      ...lines,
      ...totals,
      '',
      FEE_CAUTION,
      '',
      `The PI can withdraw the proposal, change it and submit it again until the call closes at ${formatUtc(input.cycle.callClosesAt)}.`,
    ].join('\n'),
  };
}
