/**
 * Property (fast-check): whatever sequence of award decisions a manager makes without an
 * override, on whatever capacities, the node-hours awarded on a node never exceed what the
 * cycle offers there. Decisions run through the service against the test database, some of
 * them at the same time (the capacity rows are locked per cycle), and every single decision is
 * also checked against a model: it must be accepted exactly when it fits.
 */
import fc from 'fast-check';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import type { AwardInput } from '@spincycle/shared/awards/awards';
import { startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { AppError } from '../../http/app-error';
import { decideAward } from './award-service';
import { account, awardVersion, createAwardFixture, type AwardFixture } from './testing/award-fixtures';

let h: Harness;
let net: TestNetwork;
let viewer: SessionUser;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'AC');
  const m = await account(h, ['facility_manager'], 'Manager Property');
  viewer = { id: m.id, email: m.email, displayName: m.displayName, affiliation: 'Test Station', roles: ['facility_manager'] };
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const PROPOSALS = 4;

/** One decision: which proposal, the outcome, node-hours on node 0 and 1 (0 = not on that node). */
const decisionArb = fc.record({
  proposal: fc.nat(PROPOSALS - 1),
  outcome: fc.constantFrom('awarded', 'awarded', 'reserve', 'not_awarded'),
  hours: fc.tuple(fc.integer({ min: 0, max: 6000 }), fc.integer({ min: 0, max: 6000 })).map(([a, b]) => [a / 100, b / 100]),
});

/** A step: one decision, or two or three on different proposals sent at once. */
const stepArb = fc
  .array(decisionArb, { minLength: 1, maxLength: 3 })
  .map((ds) => ds.filter((d, i) => ds.findIndex((e) => e.proposal === d.proposal) === i));

const problemArb = fc.record({
  capacities: fc.tuple(fc.integer({ min: 0, max: 10000 }), fc.integer({ min: 0, max: 10000 })).map(([a, b]) => [a / 100, b / 100]),
  steps: fc.array(stepArb, { minLength: 1, maxLength: 6 }),
});

type Decision = { proposal: number; outcome: string; hours: number[] };

function inputFor(d: Decision, f: AwardFixture, version: number): AwardInput {
  const nodes =
    d.outcome === 'not_awarded' ? [] : d.hours.map((nodeHours, i) => ({ nodeId: f.nodeIds[i], nodeHours })).filter((n) => n.nodeHours > 0);
  // An award needs a node: give it a hundredth on node 0 when the draw had none.
  if (d.outcome === 'awarded' && !nodes.length) nodes.push({ nodeId: f.nodeIds[0], nodeHours: 0.01 });
  return { version, outcome: d.outcome as AwardInput['outcome'], nodes, targetIds: null, overrideReason: null };
}

async function awardedSums(f: AwardFixture): Promise<number[]> {
  const rows = (await h.created.ctx
    .db('award_nodes as an')
    .join('awards as aw', 'aw.proposal_id', 'an.proposal_id')
    .where({ 'aw.cycle_id': f.cycleId, 'aw.outcome': 'awarded' })
    .groupBy('an.node_id')
    .select('an.node_id', h.created.ctx.db.raw('sum(an.node_hours) AS hours'))) as { node_id: number; hours: number }[];
  return f.nodeIds.map((id) => Number(rows.find((r) => r.node_id === id)?.hours ?? 0));
}

it('the awarded node-hours on a node never exceed what it offers (no override)', async () => {
  await fc.assert(
    fc.asyncProperty(problemArb, async ({ capacities, steps }) => {
      const f = await createAwardFixture(h, net, {
        capacities,
        proposals: Array.from({ length: PROPOSALS }, () => [[{ node: 0, hours: 10 }]]),
      });
      // The model: each proposal's awarded hours per node.
      const model = new Map<number, number[]>();
      for (const step of steps) {
        const versions = await Promise.all(step.map((d) => awardVersion(h, f.proposalIds[d.proposal])));
        const inputs = step.map((d, i) => inputFor(d, f, versions[i]));
        const results = await Promise.allSettled(
          inputs.map((input, i) => decideAward(h.created.ctx, viewer, f.proposalIds[step[i].proposal], input)),
        );
        for (const r of results) {
          // Only capacity refusals are expected.
          if (r.status === 'rejected') expect(r.reason).toEqual(expect.objectContaining({ code: 'capacity_exceeded' }));
          if (r.status === 'rejected') expect(r.reason).toBeInstanceOf(AppError);
        }
        if (step.length === 1) {
          // One decision at a time: accepted exactly when it fits beside the others (the model).
          const d = step[0];
          const input = inputs[0];
          const fits =
            input.outcome !== 'awarded' ||
            input.nodes.every((n) => {
              const node = f.nodeIds.indexOf(n.nodeId);
              const others = [...model].filter(([p]) => p !== d.proposal).reduce((s, [, hrs]) => s + hrs[node], 0);
              return Math.round((others + n.nodeHours) * 100) <= Math.round(capacities[node] * 100);
            });
          expect(results[0].status).toBe(fits ? 'fulfilled' : 'rejected');
        }
        // Bring the model in line with what was stored.
        const stored = await h.created.ctx.db('awards').whereIn('proposal_id', f.proposalIds).select('proposal_id', 'outcome');
        model.clear();
        for (const s of stored) {
          if (s.outcome !== 'awarded') continue;
          const nodes = await h.created.ctx.db('award_nodes').where('proposal_id', s.proposal_id).select('node_id', 'node_hours');
          model.set(
            f.proposalIds.indexOf(s.proposal_id),
            f.nodeIds.map((id) => Number(nodes.find((n: { node_id: number }) => n.node_id === id)?.node_hours ?? 0)),
          );
        }
        const sums = await awardedSums(f);
        sums.forEach((sum, i) => expect(Math.round(sum * 100)).toBeLessThanOrEqual(Math.round(capacities[i] * 100)));
      }
    }),
    { numRuns: 15 },
  );
}, 60_000);
