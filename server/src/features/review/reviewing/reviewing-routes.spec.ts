import type { MyReviewRow, MyReviews, ReviewProposal } from '@spincycle/shared/review/reviewing';
import { createAccount, signedIn, type Harness, startHarness, Browser } from '../../../../../test/support/api-harness';
import { binaryBody, createTestNetwork, tinyPdf, type TestNetwork } from '../../../../../test/api/support/proposal-kit';
import { computeAndStoreProposalPlans } from '../../proposals/plans/plan-service';
import { assign, closeCall, submittedProposal } from './testing/review-fixtures';

let h: Harness;
let net: TestNetwork;
/** Three submitted proposals of the first cycle; one of a second cycle. */
let p: Awaited<ReturnType<typeof submittedProposal>>[];
let other: Awaited<ReturnType<typeof submittedProposal>>;
let otherCycle: { id: number; code: string };
/** Proposals of the first cycle whose plans the test of kept assessments rewrites (no other test reads them). */
let keptOwn: Awaited<ReturnType<typeof submittedProposal>>;
let keptExtra: Awaited<ReturnType<typeof submittedProposal>>;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'RV');
  const nodes = [net.nodeIds[0], net.nodeIds[2]];
  p = [];
  for (let i = 0; i < 3; i++) p.push(await submittedProposal(h, net.cycleId, nodes, `Reviewed proposal ${i}`));
  keptOwn = await submittedProposal(h, net.cycleId, nodes, 'Kept assessment proposal');
  keptExtra = await submittedProposal(h, net.cycleId, [net.nodeIds[0]], 'Kept assessment second proposal');
  otherCycle = await net.createCycle();
  other = await submittedProposal(h, otherCycle.id, [net.nodeIds[1]], 'Other cycle proposal');
  await closeCall(h, net.cycleId);
  await closeCall(h, otherCycle.id);
}, 120_000);

afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const db = () => h.created.ctx.db;

async function reviewer() {
  return signedIn(h, ['reviewer']);
}

async function rowOf(b: Browser, proposalId: number): Promise<MyReviewRow> {
  const res = await b.get('/api/review/my');
  expect(res.status).toBe(200);
  const row = (res.body as MyReviews).reviews.find((r) => r.proposalId === proposalId);
  if (!row) throw new Error(`no row of proposal ${proposalId}`);
  return row;
}

describe('GET /api/review/my', () => {
  it('lists only the reviewer’s own assignments, with their own review, never another reviewer’s grade; filters by cycle', async () => {
    const me = await reviewer();
    const someoneElse = await reviewer();
    await assign(h, p[0].id, me.account.id, { grade: 6.5 });
    await assign(h, p[1].id, me.account.id);
    await assign(h, other.id, me.account.id);
    await assign(h, p[0].id, someoneElse.account.id, { grade: 9.9 });
    await assign(h, p[2].id, someoneElse.account.id, { grade: 1.1 });

    const res = await me.browser.get('/api/review/my');
    expect(res.status).toBe(200);
    const body = res.body as MyReviews;
    expect(body.reviews.map((r) => r.proposalId).sort()).toEqual([p[0].id, p[1].id, other.id].sort());
    expect(JSON.stringify(body)).not.toContain('9.9');
    expect(JSON.stringify(body)).not.toContain('1.1');
    const first = body.reviews.find((r) => r.proposalId === p[0].id)!;
    expect(first).toMatchObject({
      title: 'Reviewed proposal 0',
      category: 'Open clusters',
      cycleCode: net.cycleCode,
      grade: 6.5,
      locked: false,
      lockedBecause: null,
      submittedAt: null,
      version: 1,
      team: { piName: expect.any(String), affiliations: ['Test Station'] },
    });
    expect(first.abstractShort.length).toBeLessThanOrEqual(300);
    expect(first.assessment.targetCount).toBe(2);
    expect(first.assessment.line).toMatch(/of 2 targets feasible/);
    expect(body.cycles.find((c) => c.id === net.cycleId)).toMatchObject({ assigned: 2, graded: 1, submitted: 0 });

    const filtered = await me.browser.get(`/api/review/my?cycleId=${otherCycle.id}`);
    expect((filtered.body as MyReviews).reviews.map((r) => r.proposalId)).toEqual([other.id]);
    const bad = await me.browser.get('/api/review/my?cycleId=abc');
    expect(bad.status).toBe(400);
    expect(bad.body.message).toMatch(/^cycleId: /);
  });

  it('a draft proposal is not shown even when an assignment row exists (withdrawn after assignment)', async () => {
    const me = await reviewer();
    const draft = await db()('proposals').insert({ cycle_id: net.cycleId, pi_account_id: p[0].account.id, title: 'Draft' }).returning('id');
    await assign(h, draft[0].id, me.account.id);
    expect((await me.browser.get('/api/review/my')).body.reviews).toEqual([]);
    expect((await me.browser.get(`/api/review/my/${draft[0].id}`)).status).toBe(404);
  });

  it('rows lock once the review deadline has passed (by the server clock)', async () => {
    const me = await reviewer();
    await assign(h, p[1].id, me.account.id);
    const deadline = (await db()('cycles').where({ id: net.cycleId }).first('review_deadline')).review_deadline as Date;
    const realNow = h.created.ctx.now;
    h.created.ctx.now = () => new Date(deadline.getTime() + 1000);
    try {
      const row = await rowOf(me.browser, p[1].id);
      expect(row).toMatchObject({ locked: true, lockedBecause: 'deadline', reviewDeadline: deadline.toISOString() });
      const save = await me.browser.put(`/api/review/my/${p[1].id}/review`, {
        version: row.version,
        grade: 5,
        strengths: '',
        weaknesses: '',
        committeeNote: '',
      });
      expect(save.status).toBe(409);
      expect(save.body.code).toBe('review_locked');
      expect(save.body.message).toContain('review deadline');
    } finally {
      h.created.ctx.now = realNow;
    }
  });
});

describe('the grading table kept by the web process', () => {
  it('is sent again only while nothing it shows changed: grades, titles, names, anonymity, conflicts and the deadline show at once', async () => {
    const me = await reviewer();
    await assign(h, p[2].id, me.account.id);
    await assign(h, other.id, me.account.id);
    const first = await me.browser.get('/api/review/my');
    const again = await me.browser.get('/api/review/my');
    expect(again.headers.etag).toBe(first.headers.etag);
    expect(again.body).toEqual(first.body);
    expect((await me.browser.get('/api/review/my').set('If-None-Match', first.headers.etag)).status).toBe(304);

    // Written straight into the database, as another process (or a colleague's request) would.
    await db()('review_assignments').where({ proposal_id: p[2].id, reviewer_account_id: me.account.id }).update({ grade: 4.2 });
    expect((await rowOf(me.browser, p[2].id)).grade).toBe(4.2);
    const title = (await db()('proposals').where({ id: p[2].id }).first('title')).title as string;
    await db()('proposals').where({ id: p[2].id }).update({ title: 'Retitled while kept' });
    try {
      expect((await rowOf(me.browser, p[2].id)).title).toBe('Retitled while kept');
    } finally {
      await db()('proposals').where({ id: p[2].id }).update({ title });
    }
    const pi = (await db()('proposals').where({ id: other.id }).first('pi_account_id')).pi_account_id as number;
    const piName = (await db()('accounts').where({ id: pi }).first('display_name')).display_name as string;
    await db()('accounts').where({ id: pi }).update({ display_name: 'Renamed While Kept' });
    try {
      expect((await rowOf(me.browser, other.id)).team?.piName).toBe('Renamed While Kept');
      await db()('cycles').where({ id: otherCycle.id }).update({ anonymous_review: true });
      expect((await rowOf(me.browser, other.id)).team).toBeNull();
      expect(JSON.stringify((await me.browser.get('/api/review/my')).body)).not.toContain('Renamed While Kept');
    } finally {
      await db()('cycles').where({ id: otherCycle.id }).update({ anonymous_review: false });
      await db()('accounts').where({ id: pi }).update({ display_name: piName });
    }
    await db()('review_conflicts').insert({ proposal_id: other.id, reviewer_account_id: me.account.id, reason: 'Kept-table test' });
    const mine = (await me.browser.get('/api/review/my')).body as MyReviews;
    expect(mine.reviews.map((r) => r.proposalId)).toEqual([p[2].id]);

    // The deadline passes with nothing written: the kept table is not sent after it.
    expect((await rowOf(me.browser, p[2].id)).locked).toBe(false);
    const deadline = (await db()('cycles').where({ id: net.cycleId }).first('review_deadline')).review_deadline as Date;
    const realNow = h.created.ctx.now;
    h.created.ctx.now = () => new Date(deadline.getTime() + 1);
    try {
      expect(await rowOf(me.browser, p[2].id)).toMatchObject({ locked: true, lockedBecause: 'deadline' });
    } finally {
      h.created.ctx.now = realNow;
    }
  });
});

describe('the technical assessments kept by the web process', () => {
  it('never answers from a kept assessment after a plan is written, a target renamed or the plans recomputed; grades, assignments and conflicts show at once', async () => {
    const own = keptOwn;
    const extra = keptExtra;
    const me = await reviewer();
    await assign(h, own.id, me.account.id);
    const reading = async () => (await me.browser.get(`/api/review/my/${own.id}`)).body as ReviewProposal;
    /** What the assessment must say, counted in this test from the stored rows (worked by hand in this test). */
    const expected = async () => {
      const plans: { target_id: number; feasible: boolean | null }[] = await db()('target_plans')
        .where({ proposal_id: own.id })
        .whereNotNull('summary')
        .select('target_id', 'feasible');
      const targets: { id: number; name: string }[] = await db()('targets')
        .where({ proposal_id: own.id })
        .orderBy('position')
        .select('id', 'name');
      return {
        feasibleTargets: targets.filter((t) => plans.some((x) => x.target_id === t.id && x.feasible === true)).length,
        unplanned: targets.filter((t) => !plans.some((x) => x.target_id === t.id)).map((t) => t.name),
      };
    };

    const first = await rowOf(me.browser, own.id);
    const before = await expected();
    expect(before.feasibleTargets).toBeGreaterThan(0);
    expect(first.assessment.feasibleTargets).toBe(before.feasibleTargets);
    expect((await rowOf(me.browser, own.id)).assessment).toEqual(first.assessment);

    // A write of the plans (every plan of the proposal made infeasible): the table shows it on the next request.
    const [t1] = await db()('targets').where({ proposal_id: own.id }).orderBy('position').select('id', 'name');
    await db()('target_plans')
      .where({ proposal_id: own.id })
      .update({ feasible: false, summary: db().raw(`jsonb_set(summary, '{feasible}', 'false')`) });
    expect((await rowOf(me.browser, own.id)).assessment).toMatchObject({ feasibleTargets: 0, neededNodeHours: 0 });
    expect((await reading()).assessment.feasibleTargets).toBe(0);

    // A target's plans removed, then the target renamed: the reading page names it under its new name.
    await db()('target_plans').where({ target_id: t1.id }).del();
    expect((await reading()).assessment.targetsAtRisk.find((r) => r.targetId === t1.id)).toMatchObject({
      targetName: t1.name,
      risks: [expect.objectContaining({ kind: 'notPlanned' })],
    });
    await db()('targets')
      .where({ id: t1.id })
      .update({ name: `${t1.name} renamed` });
    expect((await reading()).assessment.targetsAtRisk.find((r) => r.targetId === t1.id)!.targetName).toBe(`${t1.name} renamed`);
    expect((await expected()).unplanned).toEqual([`${t1.name} renamed`]);
    expect((await rowOf(me.browser, own.id)).assessment.targetCount).toBe(2);

    // The plans computed again: back to what the stored rows say, in the table and on the reading page.
    await computeAndStoreProposalPlans(db(), own.id);
    const after = await expected();
    expect(after.unplanned).toEqual([]);
    const row = await rowOf(me.browser, own.id);
    expect(row.assessment.feasibleTargets).toBe(after.feasibleTargets);
    expect(row.assessment).toEqual(first.assessment);
    expect((await reading()).assessment.targetsAtRisk.flatMap((r) => r.risks.map((k) => k.kind))).not.toContain('notPlanned');

    // Grades, assignments and conflicts are read on every request.
    expect(
      (
        await me.browser.put(`/api/review/my/${own.id}/review`, {
          version: row.version,
          grade: 6.1,
          strengths: '',
          weaknesses: '',
          committeeNote: '',
        })
      ).status,
    ).toBe(200);
    expect((await rowOf(me.browser, own.id)).grade).toBe(6.1);
    await assign(h, extra.id, me.account.id);
    expect((await rowOf(me.browser, extra.id)).assessment.targetCount).toBe(2);
    expect((await me.browser.post(`/api/review/my/${extra.id}/conflict`, { reason: 'Shared a grant with the PI' })).status).toBe(201);
    expect(((await me.browser.get('/api/review/my')).body as MyReviews).reviews.map((r) => r.proposalId)).toEqual([own.id]);
  });
});

describe('GET /api/review/my/:proposalId and its justification', () => {
  it('returns abstract, nodes, targets with their stored plans, and the full assessment computed from those plans', async () => {
    const me = await reviewer();
    await assign(h, p[0].id, me.account.id);
    const res = await me.browser.get(`/api/review/my/${p[0].id}`);
    expect(res.status).toBe(200);
    const body = res.body as ReviewProposal;
    expect(body.abstract).toMatch(/^We will measure rotation periods/);
    expect(body.nodes.map((n) => n.id).sort()).toEqual([net.nodeIds[0], net.nodeIds[2]].sort());
    expect(body.targets).toHaveLength(2);
    for (const t of body.targets) {
      expect(t.plans).toHaveLength(2);
      for (const plan of t.plans) {
        expect(plan).toEqual(
          expect.objectContaining({
            feasible: expect.any(Boolean),
            visits: expect.any(Number),
            nodeHours: expect.any(Number),
            cadenceDays: expect.any(Number),
            reasons: expect.any(Array),
          }),
        );
      }
    }
    // The assessment agrees with the plans the same answer lists (independent sum in this test).
    const feasiblePlans = body.targets.flatMap((t) => t.plans.filter((x) => x.feasible));
    const needed = Math.round(feasiblePlans.reduce((s, x) => s + x.nodeHours, 0) * 100) / 100;
    expect(body.assessment.neededNodeHours).toBeCloseTo(needed, 2);
    const all = Math.round(body.targets.flatMap((t) => t.plans).reduce((s, x) => s + x.nodeHours, 0) * 100) / 100;
    expect(body.assessment.requestedNodeHours).toBeCloseTo(all, 2);
    expect(body.assessment.feasibleTargets).toBe(body.targets.filter((t) => t.plans.some((x) => x.feasible)).length);
    expect(Object.keys(body.assessment.explanations).length).toBeGreaterThanOrEqual(5);
    expect(body.review.assessment.line).toBe(
      `${body.assessment.feasibleTargets} of 2 targets feasible; ${needed} of ${all} node-hours needed; ${body.assessment.targetsAtRisk.length} ${body.assessment.targetsAtRisk.length === 1 ? 'target' : 'targets'} at risk`,
    );
    expect(body.justificationUrl).toBe(`/api/review/my/${p[0].id}/justification`);
  });

  it('streams the justification inline under a neutral name, byte for byte', async () => {
    const me = await reviewer();
    await assign(h, p[0].id, me.account.id);
    const res = await me.browser.get(`/api/review/my/${p[0].id}/justification`).buffer(true).parse(binaryBody);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe(`inline; filename="proposal-${p[0].id}-justification.pdf"`);
    expect(Buffer.compare(res.body as Buffer, tinyPdf())).toBe(0);
  });

  it('answers 404 for a proposal that does not exist and for one not assigned; 400 naming proposalId for a bad id', async () => {
    const me = await reviewer();
    expect((await me.browser.get('/api/review/my/2147483000')).status).toBe(404);
    const notMine = await me.browser.get(`/api/review/my/${p[2].id}`);
    expect(notMine.status).toBe(404);
    expect(notMine.body.code).toBe('proposal_not_found');
    const bad = await me.browser.get('/api/review/my/1e3');
    expect(bad.status).toBe(400);
    expect(bad.body.message).toMatch(/^proposalId: /);
  });
});

describe('PUT /api/review/my/:proposalId/review', () => {
  const body = (version: number, grade: number | null, extra: object = {}) => ({
    version,
    grade,
    strengths: 'Clear cadence argument.',
    weaknesses: 'Few comparison stars.',
    committeeNote: 'Fine either way.',
    ...extra,
  });

  it('saves one row, sets savedAt and raises the version; a stale version answers 409 with the stored row', async () => {
    const me = await reviewer();
    await assign(h, p[0].id, me.account.id);
    const res = await me.browser.put(`/api/review/my/${p[0].id}/review`, body(1, 7.3));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ grade: 7.3, version: 2, strengths: 'Clear cadence argument.', committeeNote: 'Fine either way.' });
    expect(res.body.savedAt).toEqual(expect.any(String));
    const stored = await db()('review_assignments').where({ proposal_id: p[0].id, reviewer_account_id: me.account.id }).first();
    expect(stored).toMatchObject({ grade: 7.3, version: 2, weaknesses: 'Few comparison stars.' });
    const stale = await me.browser.put(`/api/review/my/${p[0].id}/review`, body(1, 2));
    expect(stale.status).toBe(409);
    expect(stale.body.code).toBe('version_conflict');
    expect(stale.body.current).toMatchObject({ grade: 7.3, version: 2 });
    const cleared = await me.browser.put(`/api/review/my/${p[0].id}/review`, body(2, null));
    expect(cleared.status).toBe(200);
    expect(cleared.body.grade).toBeNull();
  });

  it('refuses 7.25, 10.1, −0.1 and text with 400 naming grade; nothing written', async () => {
    const me = await reviewer();
    await assign(h, p[0].id, me.account.id, { grade: 4 });
    for (const grade of [7.25, 10.1, -0.1, '7']) {
      const res = await me.browser.put(`/api/review/my/${p[0].id}/review`, body(1, grade as number));
      expect(res.status).toBe(400);
      expect(res.body.message).toMatch(/^grade: /);
      expect(res.body.fieldErrors.grade).toBeDefined();
    }
    const tooLong = await me.browser.put(`/api/review/my/${p[0].id}/review`, body(1, 5, { committeeNote: 'x'.repeat(2001) }));
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.message).toMatch(/^committeeNote: /);
    const stored = await db()('review_assignments').where({ proposal_id: p[0].id, reviewer_account_id: me.account.id }).first();
    expect(stored).toMatchObject({ grade: 4, version: 1, saved_at: null });
  });

  it('accepts the bounds 0.0 and 10.0 and one-decimal values such as 0.1 + 0.2', async () => {
    const me = await reviewer();
    await assign(h, p[1].id, me.account.id);
    expect((await me.browser.put(`/api/review/my/${p[1].id}/review`, body(1, 0))).body.grade).toBe(0);
    expect((await me.browser.put(`/api/review/my/${p[1].id}/review`, body(2, 10))).body.grade).toBe(10);
    expect((await me.browser.put(`/api/review/my/${p[1].id}/review`, body(3, 0.1 + 0.2))).body.grade).toBe(0.3);
  });
});

describe('POST /api/review/my/submit', () => {
  it('refuses with 400 naming the proposals without a grade; then submits all, locks them, and a second submit is 409', async () => {
    const me = await reviewer();
    await assign(h, p[0].id, me.account.id, { grade: 8 });
    await assign(h, p[1].id, me.account.id);
    await assign(h, p[2].id, me.account.id);
    await assign(h, other.id, me.account.id); // another cycle: neither needed nor submitted
    const missing = await me.browser.post('/api/review/my/submit', { cycleId: net.cycleId });
    expect(missing.status).toBe(400);
    expect(missing.body.code).toBe('grades_missing');
    expect(missing.body.proposalIds).toEqual([p[1].id, p[2].id]);
    expect(missing.body.message).toContain(`#${p[1].id} “Reviewed proposal 1”`);
    expect(missing.body.message).toContain(`#${p[2].id} “Reviewed proposal 2”`);
    expect(await db()('review_assignments').where({ reviewer_account_id: me.account.id }).whereNotNull('submitted_at')).toEqual([]);

    for (const id of [p[1].id, p[2].id]) {
      const row = await rowOf(me.browser, id);
      expect(
        (
          await me.browser.put(`/api/review/my/${id}/review`, {
            version: row.version,
            grade: 5.5,
            strengths: '',
            weaknesses: '',
            committeeNote: '',
          })
        ).status,
      ).toBe(200);
    }
    const ok = await me.browser.post('/api/review/my/submit', { cycleId: net.cycleId });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ cycleId: net.cycleId, submitted: 3 });
    const row = await rowOf(me.browser, p[0].id);
    expect(row).toMatchObject({ locked: true, lockedBecause: 'submitted', submittedAt: ok.body.submittedAt });
    expect((await rowOf(me.browser, other.id)).submittedAt).toBeNull();

    const save = await me.browser.put(`/api/review/my/${p[0].id}/review`, {
      version: row.version,
      grade: 1,
      strengths: '',
      weaknesses: '',
      committeeNote: '',
    });
    expect(save.status).toBe(409);
    expect(save.body.code).toBe('review_locked');
    expect((await me.browser.post('/api/review/my/submit', { cycleId: net.cycleId })).status).toBe(409);
    const conflict = await me.browser.post(`/api/review/my/${p[0].id}/conflict`, { reason: 'Too late' });
    expect(conflict.status).toBe(409);
  });

  it('404 for a cycle with nothing assigned; 400 naming cycleId without one', async () => {
    const me = await reviewer();
    expect((await me.browser.post('/api/review/my/submit', { cycleId: net.cycleId })).status).toBe(404);
    const bad = await me.browser.post('/api/review/my/submit', {});
    expect(bad.status).toBe(400);
    expect(bad.body.message).toMatch(/^cycleId: /);
  });
});

describe('POST /api/review/my/:proposalId/conflict', () => {
  it('removes the assignment and its grade with the conflict recorded, mails the facility managers, and every route then answers 404', async () => {
    const manager = await createAccount(h, ['facility_manager']);
    const me = await reviewer();
    await assign(h, p[2].id, me.account.id, { grade: 3.3 });
    const res = await me.browser.post(`/api/review/my/${p[2].id}/conflict`, { reason: 'I co-wrote the pilot study.' });
    expect(res.status).toBe(201);
    expect(await db()('review_assignments').where({ proposal_id: p[2].id, reviewer_account_id: me.account.id })).toEqual([]);
    expect(await db()('review_conflicts').where({ proposal_id: p[2].id, reviewer_account_id: me.account.id }).first()).toMatchObject({
      reason: 'I co-wrote the pilot study.',
    });
    const mail = await h.mail.waitFor((m) => m.to.includes(manager.email) && m.subject.includes(`#${p[2].id}`));
    expect(mail.text).toContain('I co-wrote the pilot study.');

    expect((await me.browser.get(`/api/review/my/${p[2].id}`)).status).toBe(404);
    expect((await me.browser.get(`/api/review/my/${p[2].id}/justification`)).status).toBe(404);
    expect(
      (await me.browser.put(`/api/review/my/${p[2].id}/review`, { version: 1, grade: 1, strengths: '', weaknesses: '', committeeNote: '' }))
        .status,
    ).toBe(404);
    expect((await me.browser.post(`/api/review/my/${p[2].id}/conflict`, { reason: 'again' })).status).toBe(404);
    expect((await me.browser.get('/api/review/my')).body.reviews).toEqual([]);
    // Even if someone assigns the reviewer again, the conflict keeps the proposal out of reach.
    await assign(h, p[2].id, me.account.id);
    expect((await me.browser.get(`/api/review/my/${p[2].id}`)).status).toBe(404);
    expect((await me.browser.get('/api/review/my')).body.reviews).toEqual([]);
  });

  it('a failing mailer is logged, not fatal: the conflict stands', async () => {
    const me = await reviewer();
    await assign(h, p[1].id, me.account.id);
    const mailer = h.created.ctx.mailer;
    const original = mailer.send;
    mailer.send = () => Promise.reject(new Error('SMTP down'));
    try {
      const res = await me.browser.post(`/api/review/my/${p[1].id}/conflict`, { reason: 'Former student of the PI' });
      expect(res.status).toBe(201);
    } finally {
      mailer.send = original;
    }
    expect(await db()('review_conflicts').where({ proposal_id: p[1].id, reviewer_account_id: me.account.id })).toHaveLength(1);
  });

  it('refuses an empty reason with 400 naming reason; nothing changes', async () => {
    const me = await reviewer();
    await assign(h, p[0].id, me.account.id, { grade: 2 });
    const res = await me.browser.post(`/api/review/my/${p[0].id}/conflict`, { reason: '   ' });
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/^reason: /);
    expect(await db()('review_assignments').where({ proposal_id: p[0].id, reviewer_account_id: me.account.id })).toHaveLength(1);
  });
});
