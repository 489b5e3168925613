/**
 * Test fixtures of review's standing/ sub-feature, written straight into the database (never
 * through the panels or reviewing routes, which are built separately): a cycle with a review
 * deadline, a panel with a chair and members, proposals in review assigned to it, grades.
 */
import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, createAccount, type Harness } from '../../../../../../test/support/api-harness';
import type { TestNetwork } from '../../../../../../test/api/support/proposal-kit';

export interface Account {
  id: number;
  email: string;
}

export interface PanelFixture {
  cycleId: number;
  panelId: number;
  proposalIds: number[];
  reviewers: Account[];
  chair: Account;
  pis: Account[];
  signIn(account: Account): Promise<Browser>;
}

let counter = 0;

/** A signed-in browser for an account. */
export async function browserFor(h: Harness, account: Account): Promise<Browser> {
  return new Browser(h).signIn(account.email);
}

/** A fresh account with the roles and a display name. */
export async function account(h: Harness, roles: Role[], displayName?: string): Promise<Account> {
  const a = await createAccount(h, roles, { displayName });
  return { id: a.id, email: a.email };
}

/**
 * A panel in a new cycle of the network. `grades[p][r]` is reviewer r's grade of proposal p
 * (null: assigned, not graded; undefined: not assigned). Reviewer 0 chairs the panel.
 * `deadline`: 'passed' (panel stage), 'future' or 'none'.
 */
export async function createPanelFixture(
  h: Harness,
  net: TestNetwork,
  options: {
    grades: (number | null | undefined)[][];
    deadline?: 'passed' | 'future' | 'none';
    anonymous?: boolean;
    titles?: string[];
    chair?: Account;
    cycleId?: number;
  },
): Promise<PanelFixture> {
  const db = h.created.ctx.db;
  const n = counter++;
  const cycleId = options.cycleId ?? (await net.createCycle()).id;
  const deadline = options.deadline ?? 'passed';
  await db('cycles')
    .where('id', cycleId)
    .update({
      anonymous_review: options.anonymous ?? false,
      review_deadline: deadline === 'none' ? null : new Date(Date.now() + (deadline === 'passed' ? -3600_000 : 86400_000)),
    });
  const reviewerCount = Math.max(1, ...options.grades.map((g) => g.length));
  const reviewers: Account[] = [];
  for (let r = 0; r < reviewerCount; r++) {
    reviewers.push(
      r === 0 && options.chair ? options.chair : await account(h, ['reviewer'], `Reviewer ${String.fromCharCode(65 + r)}${n}`),
    );
  }
  const chair = reviewers[0];
  const [{ id: panelId }] = await db('panels')
    .insert({ cycle_id: cycleId, name: `Panel ${net.tag}-${n}`, chair_account_id: chair.id, spread_threshold: 3 })
    .returning('id');
  await db('panel_members').insert(reviewers.map((r) => ({ panel_id: panelId, account_id: r.id })));
  const proposalIds: number[] = [];
  const pis: Account[] = [];
  for (let p = 0; p < options.grades.length; p++) {
    const pi = await account(h, ['proposer'], `Proposer ${net.tag}-${n}-${p}`);
    pis.push(pi);
    const [{ id }] = await db('proposals')
      .insert({
        cycle_id: cycleId,
        pi_account_id: pi.id,
        title: options.titles?.[p] ?? `Spin survey ${n}-${p}`,
        state: 'in_review',
        submitted_at: new Date(),
        panel_id: panelId,
      })
      .returning('id');
    await db('proposal_members').insert({ proposal_id: id, account_id: pi.id, email: pi.email, role: 'pi', accepted_at: new Date() });
    proposalIds.push(id);
    const assignments = options.grades[p]
      .map((grade, r) => ({ grade, r }))
      .filter(({ grade }) => grade !== undefined)
      .map(({ grade, r }) => ({
        proposal_id: id,
        reviewer_account_id: reviewers[r].id,
        source: 'manual',
        grade,
        saved_at: grade === null ? null : new Date(),
      }));
    if (assignments.length) await db('review_assignments').insert(assignments);
  }
  return { cycleId, panelId, proposalIds, reviewers, chair, pis, signIn: (a) => browserFor(h, a) };
}

/** A target of the proposal with one stored plan per node (feasible unless said otherwise). */
export async function addTargetWithPlans(
  h: Harness,
  proposalId: number,
  raDeg: number,
  plans: { nodeId: number; nodeHours: number; feasible?: boolean }[],
): Promise<number> {
  const db = h.created.ctx.db;
  const [{ id }] = await db('targets')
    .insert({
      proposal_id: proposalId,
      position: counter++,
      name: `Star R-${counter}`,
      ra_deg: raDeg,
      dec_deg: 20,
      magnitude: 12,
      magnitude_band: 'V',
      colour: 1,
      colour_system: 'BPRP',
      age_myr: 650,
    })
    .returning('id');
  for (const p of plans) {
    await db('proposal_nodes').insert({ proposal_id: proposalId, node_id: p.nodeId }).onConflict(['proposal_id', 'node_id']).ignore();
    await db('target_plans').insert({
      target_id: id,
      node_id: p.nodeId,
      proposal_id: proposalId,
      inputs_hash: 'test',
      feasible: p.feasible ?? true,
      node_hours: p.nodeHours,
      // A stand-in result (the pressure reads only feasible and node_hours).
      result: JSON.stringify({}),
      summary: JSON.stringify({ feasible: p.feasible ?? true, nodeHours: p.nodeHours }),
    });
  }
  return id;
}
