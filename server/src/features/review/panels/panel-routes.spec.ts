import type { AssignmentMatrix, AutomaticAssignmentResult, Panel, TeamReviewerRow } from '@spincycle/shared/review/panels';
import { Browser, signedIn, startHarness, type Harness } from '../../../../../test/support/api-harness';
import { countRows, createTestNetwork, type TestNetwork } from '../../../../../test/api/support/proposal-kit';
import { closeCall, gradeAssignment, insertProposal, insertReviewer } from './testing/panel-fixtures';

let h: Harness;
let net: TestNetwork;
let manager: Browser;
let managerId: number;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'PA');
  const m = await signedIn(h, ['facility_manager']);
  manager = m.browser;
  managerId = m.account.id;
}, 60_000);

afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const db = () => h.created.ctx.db;

async function newCycle(options: Parameters<typeof closeCall>[2] & { open?: boolean } = {}) {
  const cycle = await net.createCycle();
  if (!options.open) await closeCall(h, cycle.id, options);
  return cycle;
}

async function createPanel(cycleId: number, memberIds: number[], name = `Panel ${Math.random().toString(36).slice(2, 8)}`): Promise<Panel> {
  const res = await manager.post(`/api/review/cycles/${cycleId}/panels`, { name, memberIds, chairId: memberIds[0] });
  expect(res.status).toBe(201);
  return res.body as Panel;
}

async function matrixOf(panelId: number): Promise<AssignmentMatrix> {
  const res = await manager.get(`/api/review/panels/${panelId}/matrix`);
  expect(res.status).toBe(200);
  return res.body as AssignmentMatrix;
}

describe('review settings', () => {
  it('PUT stores mode, k, deadline and set-aside; a deadline before the call closes is refused naming the field', async () => {
    const cycle = await newCycle();
    const closes = (await db()('cycles').where({ id: cycle.id }).first('call_closes_at')).call_closes_at as Date;
    const early = await manager.put(`/api/review/cycles/${cycle.id}/settings`, {
      reviewMode: 'panel',
      reviewersPerProposal: 3,
      reviewDeadline: new Date(closes.getTime() - 1000).toISOString(),
      setAsideLateTeams: false,
    });
    expect(early.status).toBe(400);
    expect(early.body.fieldErrors).toHaveProperty('reviewDeadline');
    const k = await manager.put(`/api/review/cycles/${cycle.id}/settings`, {
      reviewMode: 'panel',
      reviewersPerProposal: 11,
      reviewDeadline: null,
      setAsideLateTeams: false,
    });
    expect(k.status).toBe(400);
    expect(k.body.message).toMatch(/^reviewersPerProposal: /);
    const deadline = new Date(closes.getTime() + 7 * 86400_000).toISOString();
    const ok = await manager.put(`/api/review/cycles/${cycle.id}/settings`, {
      reviewMode: 'distributed',
      reviewersPerProposal: 4,
      reviewDeadline: deadline,
      setAsideLateTeams: true,
    });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({
      cycleId: cycle.id,
      reviewMode: 'distributed',
      reviewersPerProposal: 4,
      reviewDeadline: deadline,
      setAsideLateTeams: true,
      callClosed: true,
    });
    expect((await manager.get(`/api/review/cycles/${cycle.id}/settings`)).body.reviewersPerProposal).toBe(4);
    expect((await manager.get('/api/review/cycles/2147483647/settings')).status).toBe(404);
  });
});

describe('panels', () => {
  it('create, read, update with the version, conflict on a stale version, delete', async () => {
    const cycle = await newCycle();
    const [a, b, c] = [await insertReviewer(h), await insertReviewer(h), await insertReviewer(h)];
    const panel = await createPanel(cycle.id, [a.id, b.id], 'Cool dwarfs');
    expect(panel).toMatchObject({ cycleId: cycle.id, name: 'Cool dwarfs', chairId: a.id, proposalCount: 0, version: 1 });
    expect(panel.members.map((m) => m.id).sort()).toEqual([a.id, b.id].sort());

    const dup = await manager.post(`/api/review/cycles/${cycle.id}/panels`, { name: 'Cool dwarfs', memberIds: [c.id], chairId: c.id });
    expect(dup.status).toBe(409);
    expect(dup.body.fieldErrors).toHaveProperty('name');

    const updated = await manager.put(`/api/review/panels/${panel.id}`, {
      version: 1,
      name: 'Cool dwarfs II',
      memberIds: [b.id, c.id],
      chairId: c.id,
    });
    expect(updated.status).toBe(200);
    expect(updated.body).toMatchObject({ name: 'Cool dwarfs II', chairId: c.id, version: 2 });
    const stale = await manager.put(`/api/review/panels/${panel.id}`, { version: 1, name: 'Other', memberIds: [b.id], chairId: b.id });
    expect(stale.status).toBe(409);
    expect(stale.body.code).toBe('version_conflict');

    expect((await manager.get(`/api/review/cycles/${cycle.id}/panels`)).body.map((p: Panel) => p.id)).toEqual([panel.id]);
    expect((await manager.delete(`/api/review/panels/${panel.id}?version=1`)).status).toBe(409);
    expect((await manager.delete(`/api/review/panels/${panel.id}?version=2`)).status).toBe(204);
    expect((await manager.get(`/api/review/panels/${panel.id}`)).status).toBe(404);
  });

  it('refuses a member without the reviewer role and a chair who is not a member, naming the field', async () => {
    const cycle = await newCycle();
    const reviewer = await insertReviewer(h);
    const proposer = await signedIn(h, ['proposer']);
    const notReviewer = await manager.post(`/api/review/cycles/${cycle.id}/panels`, {
      name: 'X',
      memberIds: [reviewer.id, proposer.account.id],
      chairId: reviewer.id,
    });
    expect(notReviewer.status).toBe(400);
    expect(notReviewer.body.fieldErrors).toEqual({ 'memberIds.1': [`account ${proposer.account.id} is not a reviewer`] });
    const chair = await manager.post(`/api/review/cycles/${cycle.id}/panels`, {
      name: 'X',
      memberIds: [reviewer.id],
      chairId: proposer.account.id,
    });
    expect(chair.status).toBe(400);
    expect(chair.body.fieldErrors).toHaveProperty('chairId');
    expect(await countRows(h, 'panels', { cycle_id: cycle.id })).toBe(0);
  });
});

describe('proposals to panels', () => {
  it('only after the call closes; submitted → in review; drafts and other cycles refused naming the row; removal → submitted', async () => {
    const cycle = await newCycle({ open: true });
    const other = await newCycle();
    const reviewer = await insertReviewer(h);
    const panel = await createPanel(cycle.id, [reviewer.id]);
    const p1 = await insertProposal(h, cycle.id);
    const p2 = await insertProposal(h, cycle.id);
    const draft = await insertProposal(h, cycle.id, { state: 'draft', title: 'Unfinished draft' });
    const foreign = await insertProposal(h, other.id);

    const open = await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [p1.id] });
    expect(open.status).toBe(409);
    expect(open.body.code).toBe('call_open');
    await closeCall(h, cycle.id);

    const refused = await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [p1.id, draft.id, foreign.id] });
    expect(refused.status).toBe(409);
    expect(refused.body.fieldErrors['proposalIds.1'][0]).toMatch(/Unfinished draft.*draft/);
    expect(refused.body.fieldErrors['proposalIds.2'][0]).toMatch(new RegExp(`no proposal ${foreign.id}`));
    expect((await db()('proposals').where({ id: p1.id }).first()).state).toBe('submitted');

    const ok = await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [p1.id, p2.id] });
    expect(ok.status).toBe(200);
    expect(ok.body.proposalCount).toBe(2);
    expect(await db()('proposals').whereIn('id', [p1.id, p2.id]).orderBy('id').pluck('state')).toEqual(['in_review', 'in_review']);

    await db()('review_assignments').insert({ proposal_id: p2.id, reviewer_account_id: reviewer.id, source: 'manual', grade: 5 });
    const gradedOut = await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [] });
    expect(gradedOut.status).toBe(409);
    const out = await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [p2.id] });
    expect(out.status).toBe(200);
    expect(await db()('proposals').where({ id: p1.id }).first()).toMatchObject({ state: 'submitted', panel_id: null });

    const list = await manager.get(`/api/review/cycles/${cycle.id}/proposals`);
    expect(list.body.map((p: { id: number }) => p.id).sort()).toEqual([p1.id, p2.id].sort());
  });
});

describe('assignment by hand', () => {
  it('assigns an eligible member (mail with deadline and link, notified_at set), refuses an ineligible one with the reason', async () => {
    const cycle = await newCycle({ anonymous: true });
    const ok = await insertReviewer(h);
    const sameShop = await insertReviewer(h, { affiliation: '  invented   Observatory ' });
    const proposal = await insertProposal(h, cycle.id, { piAffiliation: 'Invented Observatory', title: 'Spin of invented dwarfs' });
    const panel = await createPanel(cycle.id, [ok.id, sameShop.id]);
    await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [proposal.id] });

    const refused = await manager.put(`/api/review/panels/${panel.id}/assignments`, {
      proposalId: proposal.id,
      reviewerId: sameShop.id,
      assigned: true,
    });
    expect(refused.status).toBe(409);
    expect(refused.body.code).toBe('reviewer_ineligible');
    expect(refused.body.message).toMatch(/same affiliation/i);

    const res = await manager.put(`/api/review/panels/${panel.id}/assignments`, {
      proposalId: proposal.id,
      reviewerId: ok.id,
      assigned: true,
    });
    expect(res.status).toBe(200);
    const matrix = res.body as AssignmentMatrix;
    expect(matrix.proposals[0].count).toBe(1);
    expect(matrix.proposals[0].cells).toEqual(
      matrix.reviewers.map((r) =>
        r.id === ok.id
          ? { state: 'assigned', source: 'manual', graded: false, expertiseMatch: false }
          : { state: 'ineligible', reason: 'same_affiliation', label: 'Same affiliation as a team member' },
      ),
    );
    const mail = await h.mail.waitFor((m) => m.to.includes(ok.email));
    expect(mail.text).toContain('http://spincycle.test/review/my');
    expect(mail.text).toContain('Spin of invented dwarfs');
    expect(mail.text).toMatch(/Grades are due by \d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/);
    const pi = await db()('accounts').where({ id: proposal.pi.id }).first('display_name');
    expect(mail.text).not.toContain(pi.display_name);
    // The mail is sent before the answer, so the row is marked by now.
    const row = await db()('review_assignments').where({ proposal_id: proposal.id, reviewer_account_id: ok.id }).first();
    expect(row.notified_at).not.toBeNull();
    expect(row.assigned_by).toBe(managerId);

    await gradeAssignment(h, proposal.id, ok.id);
    const unassign = await manager.put(`/api/review/panels/${panel.id}/assignments`, {
      proposalId: proposal.id,
      reviewerId: ok.id,
      assigned: false,
    });
    expect(unassign.status).toBe(409);
    expect(unassign.body.code).toBe('assignment_graded');
  });

  it('a failed mail does not fail the assignment', async () => {
    const cycle = await newCycle();
    const r = await insertReviewer(h);
    const proposal = await insertProposal(h, cycle.id);
    const panel = await createPanel(cycle.id, [r.id]);
    await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [proposal.id] });
    const send = h.created.ctx.mailer.send;
    h.created.ctx.mailer.send = async () => {
      throw new Error('relay down');
    };
    try {
      const res = await manager.put(`/api/review/panels/${panel.id}/assignments`, {
        proposalId: proposal.id,
        reviewerId: r.id,
        assigned: true,
      });
      expect(res.status).toBe(200);
    } finally {
      h.created.ctx.mailer.send = send;
    }
    expect((await db()('review_assignments').where({ proposal_id: proposal.id }).first()).notified_at).toBeNull();
  });
});

describe('automatic assignment', () => {
  it('k per proposal, loads within one, manual cells kept, ungraded automatic ones replaced, expertise preferred', async () => {
    const cycle = await newCycle({ k: 2 });
    const reviewers: Awaited<ReturnType<typeof insertReviewer>>[] = [];
    for (let i = 0; i < 4; i++) reviewers.push(await insertReviewer(h, { expertise: i < 2 ? ['Field stars'] : [] }));
    const proposals: Awaited<ReturnType<typeof insertProposal>>[] = [];
    for (let i = 0; i < 5; i++) proposals.push(await insertProposal(h, cycle.id, { category: i === 0 ? 'Field stars' : 'Open clusters' }));
    const panel = await createPanel(
      cycle.id,
      reviewers.map((r) => r.id),
    );
    await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: proposals.map((p) => p.id) });
    await manager.put(`/api/review/panels/${panel.id}/assignments`, {
      proposalId: proposals[1].id,
      reviewerId: reviewers[3].id,
      assigned: true,
    });

    const first = await manager.post(`/api/review/panels/${panel.id}/assign-automatically`);
    expect(first.status).toBe(200);
    const result = first.body as AutomaticAssignmentResult;
    // Worked by hand in this test: 5 proposals × k = 2 = 10 cells over 4 reviewers → loads 2 or 3; 1 manual + 9 new.
    expect(result.added).toBe(9);
    for (const p of result.matrix.proposals) expect(p.count).toBe(2);
    const loads = result.matrix.reviewers.map((r) => r.load);
    expect(Math.max(...loads) - Math.min(...loads)).toBeLessThanOrEqual(1);
    const manualCell = result.matrix.proposals.find((p) => p.id === proposals[1].id)!.cells[
      result.matrix.reviewers.findIndex((r) => r.id === reviewers[3].id)
    ];
    expect(manualCell).toMatchObject({ state: 'assigned', source: 'manual' });
    const fieldRow = result.matrix.proposals.find((p) => p.id === proposals[0].id)!;
    expect(fieldRow.cells.filter((c) => c.state === 'assigned' && c.expertiseMatch)).toHaveLength(2);

    // A grade on one automatic cell keeps it; a rerun replaces only the ungraded automatic ones.
    const auto = await db()('review_assignments')
      .whereIn(
        'proposal_id',
        proposals.map((p) => p.id),
      )
      .where({ source: 'automatic' })
      .first();
    await db()('review_assignments').where({ id: auto.id }).update({ grade: 6 });
    const again = await manager.post(`/api/review/panels/${panel.id}/assign-automatically`);
    expect(again.status).toBe(200);
    expect(await db()('review_assignments').where({ id: auto.id }).first()).toBeTruthy();
    expect((again.body as AutomaticAssignmentResult).matrix.proposals.every((p) => p.count === 2)).toBe(true);
  });

  it('infeasible: 409 naming the proposal that cannot get k eligible reviewers, nothing written', async () => {
    const cycle = await newCycle({ k: 2 });
    const r1 = await insertReviewer(h);
    const r2 = await insertReviewer(h, { affiliation: 'Lonely Ridge Station' });
    const blocked = await insertProposal(h, cycle.id, { title: 'Nobody may read this', piAffiliation: 'lonely ridge station' });
    const fine = await insertProposal(h, cycle.id);
    const panel = await createPanel(cycle.id, [r1.id, r2.id]);
    await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [blocked.id, fine.id] });
    const res = await manager.post(`/api/review/panels/${panel.id}/assign-automatically`);
    expect(res.status).toBe(409);
    expect(res.body.code).toBe('assignment_infeasible');
    expect(res.body.message).toContain('Nobody may read this');
    expect(res.body.proposals).toEqual([{ id: blocked.id, title: 'Nobody may read this', eligibleReviewers: 1, needed: 2 }]);
    expect(await countRows(h, 'review_assignments', { proposal_id: blocked.id })).toBe(0);
    expect(await countRows(h, 'review_assignments', { proposal_id: fine.id })).toBe(0);
  });
});

describe('matrix', () => {
  it('shows conflicts with their reason and the not-discussed flag', async () => {
    const cycle = await newCycle();
    const r = await insertReviewer(h);
    const p = await insertProposal(h, cycle.id);
    const panel = await createPanel(cycle.id, [r.id]);
    await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [p.id] });
    await db()('review_conflicts').insert({ proposal_id: p.id, reviewer_account_id: r.id, reason: 'Former student of the PI' });
    await db()('proposals').where({ id: p.id }).update({ not_discussed: true });
    const m = await matrixOf(panel.id);
    expect(m.reviewersPerProposal).toBe(2);
    expect(m.proposals[0]).toMatchObject({
      id: p.id,
      count: 0,
      notDiscussed: true,
      cells: [{ state: 'conflict', reason: 'Former student of the PI' }],
    });
    expect(m.reviewers[0]).toMatchObject({ id: r.id, chair: true, load: 0 });
  });
});

describe('the matrix kept by the web process', () => {
  it('sends a kept answer again only while nothing it shows changed: grades, assignments, conflicts, teams and members show at once', async () => {
    const cycle = await newCycle();
    const a = await insertReviewer(h, { expertise: ['Open clusters'] });
    const b = await insertReviewer(h);
    const p = await insertProposal(h, cycle.id, { title: 'Kept matrix proposal' });
    const panel = await createPanel(cycle.id, [a.id, b.id]);
    await manager.put(`/api/review/panels/${panel.id}/proposals`, { proposalIds: [p.id] });
    const url = `/api/review/panels/${panel.id}/matrix`;
    const cells = async () => (await matrixOf(panel.id)).proposals[0].cells;
    const column = (m: AssignmentMatrix, id: number) => m.reviewers.findIndex((r) => r.id === id);

    const first = await manager.get(url);
    const again = await manager.get(url);
    expect(again.headers.etag).toBe(first.headers.etag);
    expect(again.body).toEqual(first.body);
    expect((await manager.get(url).set('If-None-Match', first.headers.etag)).status).toBe(304);
    const m0 = first.body as AssignmentMatrix;
    expect(m0.proposals[0].cells[column(m0, a.id)]).toEqual({ state: 'free', expertiseMatch: true });

    // An assignment by hand, then a grade written by the reviewer (not through the manager's routes).
    expect(
      (await manager.put(`/api/review/panels/${panel.id}/assignments`, { proposalId: p.id, reviewerId: a.id, assigned: true })).status,
    ).toBe(200);
    expect((await cells())[column(m0, a.id)]).toEqual({ state: 'assigned', source: 'manual', graded: false, expertiseMatch: true });
    await gradeAssignment(h, p.id, a.id, 6.4);
    const graded = await manager.get(url);
    expect(graded.headers.etag).not.toBe(first.headers.etag);
    expect((graded.body as AssignmentMatrix).proposals[0].cells[column(m0, a.id)]).toMatchObject({ graded: true });

    // A conflict declared, a reviewer joining the team, a member's affiliation, a member losing the role.
    await db()('review_conflicts').insert({ proposal_id: p.id, reviewer_account_id: b.id, reason: 'Shared an office with the PI' });
    expect((await cells())[column(m0, b.id)]).toEqual({ state: 'conflict', reason: 'Shared an office with the PI' });
    await db()('review_conflicts').where({ proposal_id: p.id, reviewer_account_id: b.id }).del();
    expect((await cells())[column(m0, b.id)]).toEqual({ state: 'free', expertiseMatch: false });
    await db()('accounts').whereIn('id', [b.id, p.pi.id]).update({ affiliation: 'Kept Matrix Institute' });
    expect((await cells())[column(m0, b.id)]).toMatchObject({ state: 'ineligible', reason: 'same_affiliation' });
    await db()('proposal_members').insert({ proposal_id: p.id, account_id: b.id, email: b.email, role: 'coi', accepted_at: null });
    expect((await cells())[column(m0, b.id)]).toMatchObject({ state: 'ineligible', reason: 'team_member' });
    await db()('account_roles').where({ account_id: b.id, role: 'reviewer' }).del();
    const left = await matrixOf(panel.id);
    expect(left.reviewers.map((r) => r.id)).toEqual([a.id]);
    expect(left.proposals[0].cells).toHaveLength(1);
  });
});

describe('distributed review', () => {
  it('the PI names a reviewer (co-I 403, outsider 404), the manager distributes k each, late teams are set aside', async () => {
    const cycle = await newCycle({ mode: 'distributed', k: 1 });
    const teams = [await insertProposal(h, cycle.id), await insertProposal(h, cycle.id), await insertProposal(h, cycle.id)];
    const reviewers = [await insertReviewer(h), await insertReviewer(h), await insertReviewer(h)];
    // Reviewer 0 is on team 0 (an active co-investigator): never given team 0's proposal.
    const coi = await db()('accounts').where({ id: reviewers[0].id }).first('email');
    await db()('proposal_members').insert({
      proposal_id: teams[0].id,
      account_id: reviewers[0].id,
      email: coi.email,
      role: 'coi',
      accepted_at: new Date(),
    });

    const outsider = await signedIn(h, ['proposer', 'reviewer']);
    expect((await outsider.browser.put(`/api/review/proposals/${teams[0].id}/team-reviewer`, { email: reviewers[0].email })).status).toBe(
      404,
    );
    const coiBrowser = await new Browser(h).signIn(reviewers[0].email);
    expect((await coiBrowser.put(`/api/review/proposals/${teams[0].id}/team-reviewer`, { email: reviewers[0].email })).status).toBe(403);
    for (let i = 0; i < 3; i++) {
      const pi = await teams[i].signIn();
      const res = await pi.put(`/api/review/proposals/${teams[i].id}/team-reviewer`, { email: reviewers[i].email.toUpperCase() });
      expect(res.status).toBe(200);
      expect(res.body.reviewer.id).toBe(reviewers[i].id);
    }
    const unknown = await (
      await teams[0].signIn()
    ).put(`/api/review/proposals/${teams[0].id}/team-reviewer`, { email: 'nobody@example.test' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.fieldErrors).toHaveProperty('email');

    const run = await manager.post(`/api/review/cycles/${cycle.id}/distribute`);
    expect(run.status).toBe(200);
    expect(run.body).toMatchObject({ reviewers: 3, added: 3 });
    const rows = await db()('review_assignments')
      .whereIn(
        'proposal_id',
        teams.map((t) => t.id),
      )
      .select('proposal_id', 'reviewer_account_id', 'source');
    expect(rows).toHaveLength(3);
    expect(rows.every((r) => r.source === 'team')).toBe(true);
    expect(rows.some((r) => r.proposal_id === teams[0].id && r.reviewer_account_id === reviewers[0].id)).toBe(false);
    // Balanced (worked by hand in this test): 3 reviews over 3 proposals → one each.
    expect(new Set(rows.map((r) => r.proposal_id)).size).toBe(3);
    expect(
      await db()('proposals')
        .whereIn(
          'id',
          teams.map((t) => t.id),
        )
        .pluck('state'),
    ).toEqual(['in_review', 'in_review', 'in_review']);

    // Reviewer 1 grades; the deadline passes; teams 0 and 2 are late and set aside.
    const theirs = rows.find((r) => r.reviewer_account_id === reviewers[1].id)!;
    await gradeAssignment(h, theirs.proposal_id, reviewers[1].id);
    await db()('cycles').where({ id: cycle.id }).update({ set_aside_late_teams: true });
    const deadline = (await db()('cycles').where({ id: cycle.id }).first('review_deadline')).review_deadline as Date;
    const realNow = h.created.ctx.now;
    h.created.ctx.now = () => new Date(deadline.getTime() + 1000);
    try {
      const list = await manager.get(`/api/review/cycles/${cycle.id}/team-reviewers`);
      expect(list.status).toBe(200);
      const byId = new Map((list.body as TeamReviewerRow[]).map((r) => [r.proposalId, r]));
      expect(byId.get(teams[0].id)).toMatchObject({ late: true, setAside: true, assigned: 1, graded: 0 });
      expect(byId.get(teams[1].id)).toMatchObject({ late: false, setAside: false, assigned: 1, graded: 1 });
      expect(byId.get(teams[2].id)).toMatchObject({ late: true, setAside: true });
      // Reading again changes nothing (idempotent).
      expect((await manager.get(`/api/review/cycles/${cycle.id}/team-reviewers`)).body).toEqual(list.body);
    } finally {
      h.created.ctx.now = realNow;
    }
  });
});

describe('expertise', () => {
  it('a reviewer reads and replaces their categories; duplicates and empty names are refused naming the row', async () => {
    const me = await signedIn(h, ['reviewer']);
    const put = await me.browser.put('/api/review/me/expertise', { expertise: ['Open clusters', 'Planet hosts'] });
    expect(put.status).toBe(200);
    expect(put.body.expertise).toEqual(['Open clusters', 'Planet hosts']);
    expect((await me.browser.get('/api/review/me/expertise')).body.expertise).toEqual(['Open clusters', 'Planet hosts']);
    const dup = await me.browser.put('/api/review/me/expertise', { expertise: ['A', 'a'] });
    expect(dup.status).toBe(400);
    expect(dup.body.fieldErrors).toHaveProperty(['expertise.1']);
    const empty = await me.browser.put('/api/review/me/expertise', { expertise: [' '] });
    expect(empty.status).toBe(400);
  });
});

describe('GET /api/review/me/panels', () => {
  it("lists the panels a reviewer sits on, says which they chair and when each reaches its panel stage; others' panels are not listed", async () => {
    const chair = await insertReviewer(h);
    const member = await insertReviewer(h);
    const outsider = await insertReviewer(h);
    const inReview = await newCycle();
    const atPanelStage = await newCycle({ reviewDeadline: new Date(Date.now() - 3600_000) });
    const a = await createPanel(inReview.id, [chair.id, member.id]);
    const b = await createPanel(atPanelStage.id, [member.id, chair.id]);
    const chairBrowser = await new Browser(h).signIn(chair.email);
    const mine = (await chairBrowser.get('/api/review/me/panels')).body as { panelId: number; isChair: boolean; panelStage: boolean }[];
    expect(mine.find((p) => p.panelId === a.id)).toMatchObject({ isChair: true, panelStage: false, cycleId: inReview.id });
    expect(mine.find((p) => p.panelId === b.id)).toMatchObject({ isChair: false, panelStage: true, cycleId: atPanelStage.id });
    const outsiderBrowser = await new Browser(h).signIn(outsider.email);
    expect((await outsiderBrowser.get('/api/review/me/panels')).body).toEqual([]);
    expect((await manager.get('/api/review/me/panels')).status).toBe(403);
  });
});

describe('GET /api/review/proposals/:id/team-reviewer', () => {
  it("tells the team the cycle's review mode, deadline and the viewer's part, so that only distributed review asks for a name", async () => {
    const panelCycle = await newCycle();
    const inPanel = await insertProposal(h, panelCycle.id);
    const panelAnswer = (await (await inPanel.signIn()).get(`/api/review/proposals/${inPanel.id}/team-reviewer`)).body;
    expect(panelAnswer).toMatchObject({ proposalId: inPanel.id, reviewer: null, reviewMode: 'panel', myRole: 'pi', deadlinePassed: false });
    const distributed = await newCycle({ mode: 'distributed', reviewDeadline: new Date(Date.now() - 60_000) });
    const late = await insertProposal(h, distributed.id);
    const lateAnswer = (await (await late.signIn()).get(`/api/review/proposals/${late.id}/team-reviewer`)).body;
    expect(lateAnswer).toMatchObject({ reviewMode: 'distributed', deadlinePassed: true, reviewDeadline: expect.any(String) });
  });
});
