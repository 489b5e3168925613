/**
 * Test fixtures of the awards feature, written straight into the database (the review routes
 * are tested on their own): a new cycle of the test network with chosen capacities, a panel
 * whose review deadline has passed, proposals with targets and stored plans, two reviewers
 * with grades, comments and committee notes, and (unless `locked: false`) the panel's standing
 * locked in the order the proposals are given, which makes them ranked.
 */
import type { Role } from '@spincycle/shared/accounts/roles';
import type { AwardInput } from '@spincycle/shared/awards/awards';
import { Browser, createAccount, type Harness } from '../../../../../test/support/api-harness';
import type { TestNetwork } from '../../../../../test/api/support/proposal-kit';

export interface Account {
  id: number;
  email: string;
  displayName: string;
}

/** A plan of one target on one node: the index of the node in the cycle's nodes, its node-hours. */
export interface PlanSpec {
  node: number;
  hours: number;
  feasible?: boolean;
}

export interface AwardFixture {
  cycleId: number;
  cycleCode: string;
  panelId: number;
  /** The cycle's nodes, in the order of `capacities`. */
  nodeIds: number[];
  proposalIds: number[];
  /** Per proposal, its target ids in the order given. */
  targetIds: number[][];
  titles: string[];
  pis: Account[];
  /** An accepted co-investigator of each proposal. */
  cois: Account[];
  reviewers: Account[];
  chair: Account;
  /** Strengths, weaknesses and committee notes written by the reviewers (to look for in mails). */
  texts: { strengths: string[]; weaknesses: string[]; committeeNotes: string[] };
}

let counter = 0;

/** A fresh account with the roles and a display name. */
export async function account(h: Harness, roles: Role[], displayName: string): Promise<Account> {
  const a = await createAccount(h, roles, { displayName });
  return { id: a.id, email: a.email, displayName };
}

/** A signed-in browser for an account. */
export function browserFor(h: Harness, a: { email: string }): Promise<Browser> {
  return new Browser(h).signIn(a.email);
}

/**
 * A cycle with one panel. `capacities[i]` is what the test network's node i offers; each
 * proposal lists its targets, each target its plans. `grades[p]` is [reviewer 1, reviewer 2]
 * (default 7 and 6 for every proposal).
 */
export async function createAwardFixture(
  h: Harness,
  net: TestNetwork,
  options: {
    capacities: number[];
    proposals: PlanSpec[][][];
    grades?: [number, number][];
    locked?: boolean;
  },
): Promise<AwardFixture> {
  const db = h.created.ctx.db;
  const n = counter++;
  const nodeIds = net.nodeIds.slice(0, options.capacities.length);
  const cycle = await net.createCycle({ nodeIds });
  for (let i = 0; i < nodeIds.length; i++) {
    await db('cycle_nodes').where({ cycle_id: cycle.id, node_id: nodeIds[i] }).update({ node_hours_available: options.capacities[i] });
  }
  // Call closed, review deadline passed: the panel stage.
  await db('cycles')
    .where('id', cycle.id)
    .update({
      call_opens_at: new Date(Date.now() - 20 * 86400_000),
      call_closes_at: new Date(Date.now() - 10 * 86400_000),
      review_deadline: new Date(Date.now() - 3600_000),
    });
  const reviewers = [
    await account(h, ['reviewer'], `Ysolde Marchbank ${net.tag}-${n}`),
    await account(h, ['reviewer'], `Tobiah Quenell ${net.tag}-${n}`),
  ];
  const chair = reviewers[0];
  const [{ id: panelId }] = await db('panels')
    .insert({ cycle_id: cycle.id, name: `Award panel ${net.tag}-${n}`, chair_account_id: chair.id })
    .returning('id');
  await db('panel_members').insert(reviewers.map((r) => ({ panel_id: panelId, account_id: r.id })));

  const texts = { strengths: [] as string[], weaknesses: [] as string[], committeeNotes: [] as string[] };
  const proposalIds: number[] = [];
  const targetIds: number[][] = [];
  const titles: string[] = [];
  const pis: Account[] = [];
  const cois: Account[] = [];
  for (let p = 0; p < options.proposals.length; p++) {
    const pi = await account(h, ['proposer'], `Proposer ${net.tag}-${n}-${p}`);
    const coi = await account(h, ['proposer'], `Co-investigator ${net.tag}-${n}-${p}`);
    pis.push(pi);
    cois.push(coi);
    const title = `Award survey ${net.tag}-${n}-${p}`;
    titles.push(title);
    const [{ id }] = await db('proposals')
      .insert({
        cycle_id: cycle.id,
        pi_account_id: pi.id,
        title,
        state: options.locked === false ? 'in_review' : 'ranked',
        submitted_at: new Date(Date.now() - 11 * 86400_000),
        panel_id: panelId,
      })
      .returning('id');
    proposalIds.push(id);
    await db('proposal_members').insert([
      { proposal_id: id, account_id: pi.id, email: pi.email, role: 'pi', accepted_at: new Date() },
      { proposal_id: id, account_id: coi.id, email: coi.email, role: 'coi', accepted_at: new Date() },
      // Invited, never accepted: gets no mail.
      { proposal_id: id, account_id: null, email: `pending-${net.tag}-${n}-${p}@test.example`, role: 'coi' },
    ]);
    const own: number[] = [];
    const nodesUsed = new Set<number>();
    for (let t = 0; t < options.proposals[p].length; t++) {
      const [{ id: targetId }] = await db('targets')
        .insert({
          proposal_id: id,
          position: t,
          name: `Star W${n}-${p}-${t}`,
          ra_deg: 40 + 30 * t,
          dec_deg: 20,
          magnitude: 12,
          magnitude_band: 'V',
          colour: 1,
          colour_system: 'BPRP',
          age_myr: 650,
        })
        .returning('id');
      own.push(targetId);
      for (const plan of options.proposals[p][t]) {
        const nodeId = nodeIds[plan.node];
        if (!nodesUsed.has(nodeId)) {
          nodesUsed.add(nodeId);
          await db('proposal_nodes').insert({ proposal_id: id, node_id: nodeId });
        }
        const feasible = plan.feasible ?? true;
        await db('target_plans').insert({
          target_id: targetId,
          node_id: nodeId,
          proposal_id: id,
          inputs_hash: 'test',
          feasible,
          node_hours: plan.hours,
          // Stand-ins: the awards read only feasible and node_hours.
          result: JSON.stringify({}),
          summary: JSON.stringify({ feasible, nodeHours: plan.hours }),
        });
      }
    }
    targetIds.push(own);
    const [g1, g2] = options.grades?.[p] ?? [7, 6];
    const assignments = reviewers.map((r, i) => {
      const strengths = `Clear cadence argument ${net.tag}-${n}-${p}-${i}`;
      const weaknesses = `Faint targets may fall short ${net.tag}-${n}-${p}-${i}`;
      const note = `COMMITTEE ONLY ${net.tag}-${n}-${p}-${i}`;
      texts.strengths.push(strengths);
      texts.weaknesses.push(weaknesses);
      texts.committeeNotes.push(note);
      return {
        proposal_id: id,
        reviewer_account_id: r.id,
        source: 'manual',
        grade: i === 0 ? g1 : g2,
        strengths,
        weaknesses,
        committee_note: note,
        saved_at: new Date(),
        submitted_at: new Date(),
      };
    });
    await db('review_assignments').insert(assignments);
  }
  if (options.locked !== false) {
    await db('standing_positions').insert(proposalIds.map((id, i) => ({ proposal_id: id, panel_id: panelId, position: i + 1 })));
    await db('panels').where('id', panelId).update({ standing_locked_at: new Date(), standing_locked_by: chair.id });
  }
  return {
    cycleId: cycle.id,
    cycleCode: cycle.code,
    panelId,
    nodeIds,
    proposalIds,
    targetIds,
    titles,
    pis,
    cois,
    reviewers,
    chair,
    texts,
  };
}

/** The stored version of a proposal's award (0 without one): what the next PUT must name. */
export async function awardVersion(h: Harness, proposalId: number): Promise<number> {
  const row = await h.created.ctx.db('awards').where('proposal_id', proposalId).first('version');
  return (row?.version as number | undefined) ?? 0;
}

/** An award body (version read from the database unless given). */
export async function awardBody(
  h: Harness,
  proposalId: number,
  decision: Omit<AwardInput, 'version' | 'overrideReason' | 'targetIds'> &
    Partial<Pick<AwardInput, 'version' | 'overrideReason' | 'targetIds'>>,
): Promise<AwardInput> {
  return {
    targetIds: null,
    overrideReason: null,
    ...decision,
    version: decision.version ?? (await awardVersion(h, proposalId)),
  };
}

/** Decides every proposal of the fixture as not awarded, except those given (by index). */
export async function decideAll(
  manager: Browser,
  h: Harness,
  f: AwardFixture,
  decisions: Record<number, Omit<AwardInput, 'version' | 'overrideReason' | 'targetIds'> & Partial<AwardInput>> = {},
): Promise<void> {
  for (let i = 0; i < f.proposalIds.length; i++) {
    const id = f.proposalIds[i];
    const body = await awardBody(h, id, decisions[i] ?? { outcome: 'not_awarded', nodes: [] });
    const res = await manager.put(`/api/awards/proposals/${id}`, body);
    if (res.status !== 200) throw new Error(`decision failed: ${res.status} ${JSON.stringify(res.body)}`);
  }
}
