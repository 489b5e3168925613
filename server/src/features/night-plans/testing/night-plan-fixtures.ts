/**
 * Test fixtures of the night plans, written straight into the database (the award routes are
 * tested on their own): a cycle on chosen nodes of the test network(s) with its decisions
 * released, one panel whose locked standing orders the programs as given, and per program an
 * awarded proposal (PI, an accepted co-investigator), its targets (invented stars, in the
 * winter sky of the test sites) and its program row.
 */
import type { NightPlanJobData } from '../night-plan-build';
import type { NightPlanQueue } from '../../../jobs/night-plan-queue';
import { account, type Account } from '../../awards/testing/award-fixtures';
import type { Harness } from '../../../../../test/support/api-harness';
import type { TestNetwork } from '../../../../../test/api/support/proposal-kit';

export interface ProgramSpec {
  /** Targets of the program (each gets an invented star). */
  targets: number;
  /** Awarded node-hours by node index (in `nodeIds` of the fixture); 0 or missing: not on that node. */
  hours: number[];
  /** Award only the first n targets (a partial award). */
  awardedTargets?: number;
}

export interface NightPlanFixture {
  cycleId: number;
  cycleCode: string;
  campaignStart: string;
  campaignEnd: string;
  nodeIds: number[];
  nodeCodes: string[];
  proposalIds: number[];
  titles: string[];
  targetIds: number[][];
  targetNames: string[][];
  pis: Account[];
  cois: Account[];
  reviewer: Account;
}

let counter = 0;

/** A released cycle with programs on the given nodes (`nodes`: ids and codes, e.g. net.nodes). */
export async function createNightPlanFixture(
  h: Harness,
  net: TestNetwork,
  options: { nodes: { id: number; code: string }[]; programs: ProgramSpec[]; campaignNights?: number; released?: boolean },
): Promise<NightPlanFixture> {
  const db = h.created.ctx.db;
  const n = counter++;
  const nodeIds = options.nodes.map((x) => x.id);
  const cycle = await net.createCycle({ nodeIds, campaignNights: options.campaignNights ?? 30 });
  const now = Date.now();
  await db('cycles')
    .where('id', cycle.id)
    .update({
      call_opens_at: new Date(now - 30 * 86400_000),
      call_closes_at: new Date(now - 20 * 86400_000),
      review_deadline: new Date(now - 10 * 86400_000),
      awards_released_at: options.released === false ? null : new Date(now - 86400_000),
    });
  const c = await db('cycles').where('id', cycle.id).first('campaign_start', 'campaign_end');
  const reviewer = await account(h, ['reviewer'], `Night reviewer ${net.tag}-${n}`);
  const [{ id: panelId }] = await db('panels')
    .insert({
      cycle_id: cycle.id,
      name: `Night panel ${net.tag}-${n}`,
      chair_account_id: reviewer.id,
      standing_locked_at: new Date(),
      standing_locked_by: reviewer.id,
    })
    .returning('id');
  await db('panel_members').insert({ panel_id: panelId, account_id: reviewer.id });

  const out: NightPlanFixture = {
    cycleId: cycle.id,
    cycleCode: cycle.code,
    campaignStart: c.campaign_start,
    campaignEnd: c.campaign_end,
    nodeIds,
    nodeCodes: options.nodes.map((x) => x.code),
    proposalIds: [],
    titles: [],
    targetIds: [],
    targetNames: [],
    pis: [],
    cois: [],
    reviewer,
  };
  for (let p = 0; p < options.programs.length; p++) {
    const spec = options.programs[p];
    const pi = await account(h, ['proposer'], `Night PI ${net.tag}-${n}-${p}`);
    const coi = await account(h, ['proposer'], `Night co-investigator ${net.tag}-${n}-${p}`);
    const title = `Night survey ${net.tag}-${n}-${p}`;
    const [{ id }] = await db('proposals')
      .insert({
        cycle_id: cycle.id,
        pi_account_id: pi.id,
        title,
        state: 'awarded',
        submitted_at: new Date(now - 21 * 86400_000),
        panel_id: panelId,
      })
      .returning('id');
    await db('proposal_members').insert([
      { proposal_id: id, account_id: pi.id, email: pi.email, role: 'pi', accepted_at: new Date() },
      { proposal_id: id, account_id: coi.id, email: coi.email, role: 'coi', accepted_at: new Date() },
    ]);
    const ids: number[] = [];
    const names: string[] = [];
    for (let t = 0; t < spec.targets; t++) {
      const name = `Star N${n}-${p}-${t}`;
      // Winter evening sky of the test sites (the campaign starts some 40 days from now).
      const [{ id: targetId }] = await db('targets')
        .insert({
          proposal_id: id,
          position: t,
          name,
          ra_deg: (60 + 25 * ((p + t) % 5) + 3 * t) % 360,
          dec_deg: 10 + 7 * (t % 3),
          magnitude: 11 + 0.5 * (t % 3),
          magnitude_band: 'V',
          colour: 1.1,
          colour_system: 'BPRP',
          age_myr: 650,
        })
        .returning('id');
      ids.push(targetId);
      names.push(name);
    }
    const awardedNodes = spec.hours.map((hours, k) => ({ hours, nodeId: nodeIds[k] })).filter((x) => x.hours > 0);
    await db('proposal_nodes').insert(awardedNodes.map((x) => ({ proposal_id: id, node_id: x.nodeId })));
    await db('awards').insert({
      proposal_id: id,
      cycle_id: cycle.id,
      outcome: 'awarded',
      target_ids: spec.awardedTargets ? ids.slice(0, spec.awardedTargets) : null,
      decided_at: new Date(now - 2 * 86400_000),
    });
    await db('award_nodes').insert(awardedNodes.map((x) => ({ proposal_id: id, node_id: x.nodeId, node_hours: x.hours })));
    await db('programs').insert({ proposal_id: id, cycle_id: cycle.id, state: 'scheduled' });
    await db('standing_positions').insert({ proposal_id: id, panel_id: panelId, position: p + 1 });
    out.proposalIds.push(id);
    out.titles.push(title);
    out.targetIds.push(ids);
    out.targetNames.push(names);
    out.pis.push(pi);
    out.cois.push(coi);
  }
  return out;
}

/** A queue that keeps the node jobs for the test to run (with runNightPlanNodeJob). */
export function fakeNightPlanQueue(): NightPlanQueue & { jobs: NightPlanJobData[] } {
  const jobs: NightPlanJobData[] = [];
  return {
    jobs,
    async enqueue(list) {
      jobs.push(...list);
    },
    async close() {},
  };
}

/** A planned visit written straight in (for tests that need one without a build): 30 minutes from 03:00 UTC of the night. */
export async function insertVisit(
  h: Harness,
  f: NightPlanFixture,
  options: { program?: number; target?: number; node?: number; night?: string } = {},
): Promise<number> {
  const night = options.night ?? f.campaignStart;
  const start = new Date(Date.parse(`${night}T00:00:00Z`) + 27 * 3600_000);
  const [{ id }] = await h.created.ctx
    .db('night_plan_visits')
    .insert({
      cycle_id: f.cycleId,
      node_id: f.nodeIds[options.node ?? 0],
      proposal_id: f.proposalIds[options.program ?? 0],
      target_id: f.targetIds[options.program ?? 0][options.target ?? 0],
      night_date: night,
      start_at: start,
      end_at: new Date(start.getTime() + 30 * 60_000),
      altitude_deg: 50,
      airmass: 1.3,
    })
    .returning('id');
  return Number(id);
}
