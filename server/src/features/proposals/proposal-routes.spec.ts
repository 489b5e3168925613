import { Browser, signedIn, startHarness, type Harness } from '../../../../test/support/api-harness';
import {
  addCoInvestigator,
  countRows,
  createTestNetwork,
  proposerWithDraft,
  target,
  type TestNetwork,
} from '../../../../test/api/support/proposal-kit';

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'PR');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

describe('POST /api/proposals', () => {
  it('creates a draft in an open cycle; the creator is its PI and the only team member', async () => {
    const { account, browser } = await signedIn(h, ['proposer']);
    const res = await browser.post('/api/proposals', { cycleId: net.cycleId, title: '  Spin-down of an invented cluster  ' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      title: 'Spin-down of an invented cluster',
      abstract: '',
      category: null,
      state: 'draft',
      version: 1,
      nodeIds: [],
      justification: null,
      targetCount: 0,
      request: [],
      completeness: 0.9,
      myRole: 'pi',
      editable: true,
      submittedAt: null,
      cycle: { id: net.cycleId, status: 'open', code: net.cycleCode },
    });
    expect(res.body.team).toEqual([
      {
        id: expect.any(Number),
        accountId: account.id,
        email: account.email,
        displayName: expect.any(String),
        role: 'pi',
        status: 'active',
        invitedAt: expect.any(String),
      },
    ]);
  });

  it('refuses a cycle whose call is closed or not yet open with 422 call_not_open naming the instant', async () => {
    const { browser } = await signedIn(h, ['proposer']);
    const closed = await net.createCycle({ opensInMs: -2 * 86400_000, closesInMs: -1000 });
    const upcoming = await net.createCycle({ opensInMs: 86400_000, closesInMs: 2 * 86400_000 });
    const a = await browser.post('/api/proposals', { cycleId: closed.id, title: 'Too late' });
    expect(a.status).toBe(422);
    expect(a.body).toMatchObject({ code: 'call_not_open', message: expect.stringMatching(/closed at \d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/) });
    const b = await browser.post('/api/proposals', { cycleId: upcoming.id, title: 'Too early' });
    expect(b.status).toBe(422);
    expect(b.body.message).toMatch(/opens at/);
  });

  it('validates the body (400 naming the fields) and the cycle (400 cycleId)', async () => {
    const { browser } = await signedIn(h, ['proposer']);
    const bad = await browser.post('/api/proposals', { cycleId: 'x', title: '' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fieldErrors).sort()).toEqual(['cycleId', 'title']);
    const unknown = await browser.post('/api/proposals', { cycleId: 99999999, title: 'Nowhere' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.fieldErrors.cycleId).toBeDefined();
  });

  it('needs the proposer role (403) and a session (401)', async () => {
    const { browser } = await signedIn(h, ['reviewer']);
    expect((await browser.post('/api/proposals', { cycleId: net.cycleId, title: 'No' })).status).toBe(403);
    expect((await new Browser(h).post('/api/proposals', { cycleId: net.cycleId, title: 'No' })).status).toBe(401);
  });
});

describe('GET /api/proposals', () => {
  it('lists only the viewer’s own proposals, PI or accepted co-I, with counts and the requested hours', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Listed proposal');
    const other = await proposerWithDraft(h, net.cycleId, 'Someone else’s');
    const coi = await addCoInvestigator(h, pi, proposal.id);
    await pi.post(`/api/proposals/${proposal.id}/targets`, target());
    const mine = (await pi.get('/api/proposals')).body;
    expect(mine.map((p: { id: number }) => p.id)).toEqual([proposal.id]);
    expect(mine[0]).toMatchObject({
      cycleId: net.cycleId,
      cycleCode: net.cycleCode,
      title: 'Listed proposal',
      state: 'draft',
      myRole: 'pi',
      targetCount: 1,
      requestedNodeHours: 0,
      submittedAt: null,
      callClosesAt: expect.any(String),
      piName: expect.any(String),
    });
    const theirs = (await coi.browser.get('/api/proposals')).body;
    expect(theirs).toEqual([expect.objectContaining({ id: proposal.id, myRole: 'coi' })]);
    expect((await other.browser.get('/api/proposals')).body.map((p: { id: number }) => p.id)).toEqual([other.proposal.id]);
    const reviewer = await signedIn(h, ['reviewer']);
    expect((await reviewer.browser.get('/api/proposals')).body).toEqual([]);
  });
});

describe('PATCH /api/proposals/:id (autosave)', () => {
  it('saves fields and nodes, increments the version, and queues the plans when the nodes change', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    const res = await browser.patch(`/api/proposals/${proposal.id}`, {
      version: 1,
      title: 'Renamed',
      abstract: 'An abstract.',
      category: 'Field stars',
      nodeIds: [net.nodeIds[1], net.nodeIds[0], net.nodeIds[1]],
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      title: 'Renamed',
      abstract: 'An abstract.',
      category: 'Field stars',
      version: 2,
      nodeIds: [net.nodeIds[0], net.nodeIds[1]],
    });
    expect(res.body.request).toHaveLength(2);
    expect(res.body.request.map((r: { nodeId: number }) => r.nodeId).sort()).toEqual([net.nodeIds[0], net.nodeIds[1]].sort());
    expect(
      res.body.request.every(
        (r: { nodeHours: number; feeMinor: number; targets: number }) => r.nodeHours === 0 && r.feeMinor === 0 && r.targets === 0,
      ),
    ).toBe(true);
    const run = (await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run;
    expect(run).toMatchObject({ state: 'queued', current: false });
  });

  it('an autosave that changes nothing keeps the version', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId, 'Same');
    const res = await browser.patch(`/api/proposals/${proposal.id}`, { version: 1, title: 'Same' });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(1);
  });

  it('refuses a stale version with 409 version_conflict naming the time of the other save, and writes nothing', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Shared draft');
    const coi = await addCoInvestigator(h, pi, proposal.id);
    expect((await coi.browser.patch(`/api/proposals/${proposal.id}`, { version: 1, abstract: 'Co-I text' })).status).toBe(200);
    const stale = await pi.patch(`/api/proposals/${proposal.id}`, { version: 1, abstract: 'PI text' });
    expect(stale.status).toBe(409);
    expect(stale.body.code).toBe('version_conflict');
    expect(stale.body.message).toMatch(/^Someone else on the team saved this proposal at \d\d:\d\d UTC; reload to see their changes$/);
    const now = (await pi.get(`/api/proposals/${proposal.id}`)).body;
    expect(now).toMatchObject({ abstract: 'Co-I text', version: 2 });
  });

  it('two simultaneous saves of the same version: one wins, the other gets 409', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Race');
    const coi = await addCoInvestigator(h, pi, proposal.id);
    const results = await Promise.all([
      pi.patch(`/api/proposals/${proposal.id}`, { version: 1, abstract: 'from the PI' }),
      coi.browser.patch(`/api/proposals/${proposal.id}`, { version: 1, abstract: 'from the co-I' }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    const winner = results.find((r) => r.status === 200)!.body.abstract;
    expect((await pi.get(`/api/proposals/${proposal.id}`)).body).toMatchObject({ abstract: winner, version: 2 });
  });

  it('refuses nodes outside the cycle (400 naming nodeIds), an unknown category and a bad body', async () => {
    const other = await net.createCycle({ nodeIds: [net.nodeIds[0]] });
    const { browser, proposal } = await proposerWithDraft(h, other.id);
    const nodes = await browser.patch(`/api/proposals/${proposal.id}`, { version: 1, nodeIds: [net.nodeIds[0], net.nodeIds[2]] });
    expect(nodes.status).toBe(400);
    expect(nodes.body.fieldErrors.nodeIds[0]).toContain(String(net.nodeIds[2]));
    const category = await browser.patch(`/api/proposals/${proposal.id}`, { version: 1, category: 'Exoplanets' });
    expect(category.status).toBe(400);
    expect(category.body.fieldErrors.category).toBeDefined();
    const body = await browser.patch(`/api/proposals/${proposal.id}`, { title: '' });
    expect(body.status).toBe(400);
    expect(Object.keys(body.body.fieldErrors).sort()).toEqual(['title', 'version']);
    expect((await browser.get(`/api/proposals/${proposal.id}`)).body.version).toBe(1);
  });

  it('saves the completeness (a new version) and answers it with the proposal', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId, 'Completeness');
    const res = await browser.patch(`/api/proposals/${proposal.id}`, { version: 1, completeness: 0.95 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ completeness: 0.95, version: 2 });
    expect((await browser.get(`/api/proposals/${proposal.id}`)).body.completeness).toBe(0.95);
    // The same value again changes nothing.
    expect((await browser.patch(`/api/proposals/${proposal.id}`, { version: 2, completeness: 0.95 })).body.version).toBe(2);
  });

  it.each([0.3, 0.995, 1, -0.9, '0.9', null])('refuses completeness %p with 400 naming completeness, and writes nothing', async (value) => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId, 'Bad completeness');
    const res = await browser.patch(`/api/proposals/${proposal.id}`, { version: 1, title: 'Renamed too', completeness: value });
    expect(res.status).toBe(400);
    expect(res.body.code).toBeDefined();
    expect(Object.keys(res.body.fieldErrors)).toEqual(['completeness']);
    expect(res.body.fieldErrors.completeness).toEqual(['completeness must be between 50 % and 99 %']);
    expect((await browser.get(`/api/proposals/${proposal.id}`)).body).toMatchObject({
      title: 'Bad completeness',
      completeness: 0.9,
      version: 1,
    });
  });
});

describe('DELETE /api/proposals/:id', () => {
  it('lets the PI delete a draft with everything in it; a co-I gets 403', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const coi = await addCoInvestigator(h, pi, proposal.id);
    await pi.post(`/api/proposals/${proposal.id}/targets`, target());
    const refused = await coi.browser.delete(`/api/proposals/${proposal.id}`);
    expect(refused.status).toBe(403);
    expect(refused.body.code).toBe('pi_only');
    expect((await pi.delete(`/api/proposals/${proposal.id}`)).status).toBe(204);
    expect((await pi.get(`/api/proposals/${proposal.id}`)).status).toBe(404);
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(0);
    expect(await countRows(h, 'proposal_members', { proposal_id: proposal.id })).toBe(0);
  });
});

describe('GET /api/proposals/:id', () => {
  it('answers 404 for a proposal that does not exist and 400 for a malformed id', async () => {
    const { browser } = await signedIn(h, ['proposer']);
    expect((await browser.get('/api/proposals/99999999')).status).toBe(404);
    const bad = await browser.get('/api/proposals/abc');
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors.id).toBeDefined();
  });
});

describe('accessProposal (one query for proposal, cycle and membership)', () => {
  it('reads the same proposal and cycle as their own repositories, and 404s a non-member and an invited but not yet active one', async () => {
    const { accessProposal } = await import('./proposal-access');
    const { findProposalById } = await import('./proposal-repository');
    const { findCycleById } = await import('../cycles/cycle-repository');
    const db = h.created.ctx.db;
    const { account, proposal } = await proposerWithDraft(h, net.cycleId, 'Access');
    const access = await accessProposal(db, { ...account, roles: ['proposer'] } as never, proposal.id);
    expect(access.role).toBe('pi');
    expect(access.proposal).toEqual(await findProposalById(db, proposal.id));
    expect(access.cycle).toEqual(await findCycleById(db, net.cycleId));
    const other = await signedIn(h, ['proposer']);
    await expect(accessProposal(db, { ...other.account, roles: ['proposer'] } as never, proposal.id)).rejects.toMatchObject({
      status: 404,
    });
    // A membership row not yet accepted gives no access either.
    await db('proposal_members').insert({
      proposal_id: proposal.id,
      account_id: other.account.id,
      email: other.account.email,
      role: 'coi',
    });
    await expect(accessProposal(db, { ...other.account, roles: ['proposer'] } as never, proposal.id)).rejects.toMatchObject({
      status: 404,
    });
    await db('proposal_members').where({ proposal_id: proposal.id, account_id: other.account.id }).update({ accepted_at: db.fn.now() });
    expect((await accessProposal(db, { ...other.account, roles: ['proposer'] } as never, proposal.id)).role).toBe('coi');
    await expect(accessProposal(db, { ...account, roles: ['proposer'] } as never, 987654321)).rejects.toMatchObject({ status: 404 });
  });
});
