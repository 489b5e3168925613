import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { startHarness, type Harness } from '../../../../test/support/api-harness';
import { insertProposal, insertReviewer } from './panels/testing/panel-fixtures';
import { readReviewVersions } from './review-read-version';

/**
 * The review's read versions (migration 20270125000100_review_read_versions): every write of
 * something the grading table or a panel's matrix shows raises its cycle's counter in the same
 * transaction; writes the answers do not show (drafts, a plan run's progress, a sign-in time)
 * raise nothing, so proposers filling in drafts never queue on the counters.
 */
let h: Harness;
let net: TestNetwork;
const db = () => h.created.ctx.db;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'RRV');
}, 60_000);

afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const versionOf = async (cycleId: number): Promise<number> =>
  Number((await db()('review_read_versions').where({ cycle_id: cycleId }).first('version'))?.version ?? 0);

/** Whether `write` raised the counter of `cycleId` (and the text of all counters with it). */
async function raises(cycleId: number, write: () => Promise<unknown>): Promise<boolean> {
  const before = await versionOf(cycleId);
  const text = await readReviewVersions(db());
  await write();
  const after = await versionOf(cycleId);
  if (after !== before) expect(await readReviewVersions(db())).not.toBe(text);
  return after !== before;
}

describe('the review read versions', () => {
  it('rise with every write the answers show, per statement, in the cycle of the row', async () => {
    const cycle = net.cycleId;
    const other = (await net.createCycle()).id;
    const submitted = await insertProposal(h, cycle, { title: 'Versioned proposal' });
    const reviewer = await insertReviewer(h);
    expect(await raises(cycle, () => db()('proposals').where({ id: submitted.id }).update({ title: 'Renamed proposal' }))).toBe(true);
    expect(await raises(other, () => db()('proposals').where({ id: submitted.id }).update({ title: 'Renamed again' }))).toBe(false);
    expect(
      await raises(cycle, () =>
        db()('review_assignments').insert({ proposal_id: submitted.id, reviewer_account_id: reviewer.id, source: 'manual' }),
      ),
    ).toBe(true);
    expect(await raises(cycle, () => db()('review_assignments').where({ proposal_id: submitted.id }).update({ grade: 7.1 }))).toBe(true);
    expect(
      await raises(cycle, () =>
        db()('review_conflicts').insert({ proposal_id: submitted.id, reviewer_account_id: reviewer.id, reason: 'Co-author' }),
      ),
    ).toBe(true);
    expect(await raises(cycle, () => db()('review_conflicts').where({ proposal_id: submitted.id }).del())).toBe(true);
    expect(
      await raises(cycle, () =>
        db()('proposal_members').insert({ proposal_id: submitted.id, email: 'new-member@example.test', role: 'coi' }),
      ),
    ).toBe(true);
    expect(await raises(cycle, () => db()('cycles').where({ id: cycle }).update({ anonymous_review: true }))).toBe(true);
    let panelId = 0;
    expect(
      await raises(cycle, async () => {
        [{ id: panelId }] = await db()('panels').insert({ cycle_id: cycle, name: 'Versioned panel' }).returning('id');
      }),
    ).toBe(true);
    expect(await raises(cycle, () => db()('panel_members').insert({ panel_id: panelId, account_id: reviewer.id }))).toBe(true);
    expect(await raises(cycle, () => db()('panels').where({ id: panelId }).update({ chair_account_id: reviewer.id }))).toBe(true);
    // Plan versions of a submitted proposal (its assessment changes).
    expect(await raises(cycle, () => db()('plan_runs').insert({ proposal_id: submitted.id }))).toBe(true);
    expect(await raises(cycle, () => db()('plan_runs').where({ proposal_id: submitted.id }).update({ plans_version: 7 }))).toBe(true);
    expect(await raises(cycle, () => db()('plan_runs').where({ proposal_id: submitted.id }).update({ inputs_version: 4 }))).toBe(true);
    // Accounts: names, affiliations, expertise, roles, in every cycle.
    expect(await raises(other, () => db()('accounts').where({ id: reviewer.id }).update({ display_name: 'Renamed Reviewer' }))).toBe(true);
    expect(await raises(cycle, () => db()('accounts').where({ id: reviewer.id }).update({ affiliation: 'Moved Institute' }))).toBe(true);
    expect(await raises(cycle, () => db()('account_roles').where({ account_id: reviewer.id, role: 'reviewer' }).del())).toBe(true);
  });

  it('stay put for drafts, a plan run’s progress and a sign-in time', async () => {
    const cycle = net.cycleId;
    const draft = await insertProposal(h, cycle, { state: 'draft', title: 'Draft proposal' });
    const reviewer = await insertReviewer(h);
    expect(await raises(cycle, () => db()('proposals').where({ id: draft.id }).update({ title: 'Draft renamed' }))).toBe(false);
    expect(
      await raises(cycle, () =>
        db()('proposal_members').insert({ proposal_id: draft.id, email: 'draft-member@example.test', role: 'coi' }),
      ),
    ).toBe(false);
    await db()('plan_runs').insert({ proposal_id: draft.id }).onConflict('proposal_id').ignore();
    expect(await raises(cycle, () => db()('plan_runs').where({ proposal_id: draft.id }).update({ plans_version: 99 }))).toBe(false);
    const submitted = await insertProposal(h, cycle);
    await db()('plan_runs').insert({ proposal_id: submitted.id }).onConflict('proposal_id').ignore();
    expect(await raises(cycle, () => db()('plan_runs').where({ proposal_id: submitted.id }).update({ done: 3, total: 5 }))).toBe(false);
    expect(await raises(cycle, () => db()('accounts').where({ id: reviewer.id }).update({ last_sign_in_at: new Date() }))).toBe(false);
    // Submitting the draft shows it: that write counts.
    expect(
      await raises(cycle, () => db()('proposals').where({ id: draft.id }).update({ state: 'submitted', submitted_at: new Date() })),
    ).toBe(true);
  });

  it('a write raising every cycle waits for a cycle being deleted, and skips it (no foreign-key failure)', async () => {
    const doomed = (await net.createCycle()).id;
    const reviewer = await insertReviewer(h);
    const deleting = await db().transaction();
    try {
      await deleting('cycle_nodes').where({ cycle_id: doomed }).del();
      await deleting('cycles').where({ id: doomed }).del();
      // Granting a role raises every cycle's counter; it must wait for the deletion, not fail on it.
      const grant = db()('account_roles').insert({ account_id: reviewer.id, role: 'billing_contact' });
      const settled = Promise.allSettled([grant]);
      await new Promise((r) => setTimeout(r, 200));
      await deleting.commit();
      const [result] = await settled;
      expect(result.status).toBe('fulfilled');
    } finally {
      if (!deleting.isCompleted()) await deleting.rollback();
    }
    expect(await db()('review_read_versions').where({ cycle_id: doomed }).first()).toBeUndefined();
  });
});
