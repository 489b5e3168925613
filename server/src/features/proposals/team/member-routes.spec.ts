import { Browser, createAccount, signedIn, startHarness, type Harness } from '../../../../../test/support/api-harness';
import { addCoInvestigator, createTestNetwork, proposerWithDraft, type TestNetwork } from '../../../../../test/api/support/proposal-kit';

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'ME');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const tokenIn = (text: string, kind: 'invitations' | 'sign-up') =>
  (kind === 'invitations'
    ? /http:\/\/spincycle\.test\/invitations\/([A-Za-z0-9_-]+)/
    : /http:\/\/spincycle\.test\/sign-up\?invite=([A-Za-z0-9_-]+)/
  ).exec(text)?.[1];

describe('POST /api/proposals/:id/members', () => {
  it('mails an account holder a link to /invitations/<token>; accepting makes them an active co-I', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Team work');
    const invitee = await createAccount(h, ['proposer']);
    const res = await pi.post(`/api/proposals/${proposal.id}/members`, { email: `  ${invitee.email.toUpperCase()} ` });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ accountId: null, email: invitee.email, displayName: null, role: 'coi', status: 'invited' });
    const mail = await h.mail.waitFor((m) => m.to.includes(invitee.email));
    expect(mail.subject).toContain('Team work');
    const token = tokenIn(mail.text, 'invitations');
    expect(token).toBeDefined();
    // Only a hash of the token is stored.
    const stored = await h.created.ctx.db('proposal_members').where({ id: res.body.id }).first();
    expect(stored.invite_token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(stored.invite_token_hash).not.toContain(token);

    const b = await new Browser(h).signIn(invitee.email);
    const accepted = await b.post('/api/invitations/accept', { token });
    expect(accepted.status).toBe(200);
    expect(accepted.body).toEqual({ proposalId: proposal.id });
    const seen = await b.get(`/api/proposals/${proposal.id}`);
    expect(seen.status).toBe(200);
    expect(seen.body.myRole).toBe('coi');
    expect(seen.body.team[1]).toMatchObject({ accountId: invitee.id, status: 'active', role: 'coi' });
    // The link works once.
    const again = await (await new Browser(h).signIn((await createAccount(h)).email)).post('/api/invitations/accept', { token });
    expect(again.status).toBe(400);
    expect(again.body.code).toBe('invalid_invitation');
  });

  it('mails someone without an account a sign-up link; after signing up they accept with it', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const email = `newcomer-${Date.now()}@test.example`;
    expect((await pi.post(`/api/proposals/${proposal.id}/members`, { email })).status).toBe(201);
    const mail = await h.mail.waitFor((m) => m.to.includes(email));
    const token = tokenIn(mail.text, 'sign-up');
    expect(token).toBeDefined();
    const b = new Browser(h);
    expect((await b.post('/api/auth/sign-up', { email, password: 'long enough password', displayName: 'New Colleague' })).status).toBe(202);
    // Sign-up answers before the account exists (it does not reveal existing ones): the welcome mail says it is ready.
    await h.mail.waitFor((m) => m.to.includes(email) && /welcome/i.test(m.subject));
    await b.signIn(email, 'long enough password');
    expect((await b.post('/api/invitations/accept', { token })).body).toEqual({ proposalId: proposal.id });
    expect((await b.get('/api/proposals')).body.map((p: { id: number }) => p.id)).toEqual([proposal.id]);
  });

  it('the link is the credential: another address may accept it; an account already on the team gets 409', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    await pi.post(`/api/proposals/${proposal.id}/members`, { email: 'private-address@test.example' });
    const mail = await h.mail.waitFor((m) => m.to.includes('private-address@test.example'));
    const token = tokenIn(mail.text, 'sign-up')!;
    const piAccepting = await pi.post('/api/invitations/accept', { token });
    expect(piAccepting.status).toBe(409);
    expect(piAccepting.body.code).toBe('already_member');
    const { account, browser } = await signedIn(h, ['proposer']);
    expect((await browser.post('/api/invitations/accept', { token })).status).toBe(200);
    const team = (await pi.get(`/api/proposals/${proposal.id}`)).body.team;
    // An active member is listed with their account's address.
    expect(team).toEqual([
      expect.objectContaining({ role: 'pi' }),
      expect.objectContaining({ accountId: account.id, email: account.email, status: 'active' }),
    ]);
  });

  it('inviting a pending address again sends a fresh link (the old one stops working); a member gets 409', async () => {
    const { account: piAccount, browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const invitee = await createAccount(h);
    const first = await pi.post(`/api/proposals/${proposal.id}/members`, { email: invitee.email });
    const oldToken = tokenIn((await h.mail.waitFor((m) => m.to.includes(invitee.email))).text, 'invitations')!;
    h.mail.clear();
    // At most one mail per address and proposal every 10 minutes: let them pass.
    await h.created.ctx
      .db('proposal_invitation_mails')
      .where({ proposal_id: proposal.id })
      .update({ sent_at: new Date(Date.now() - 11 * 60_000) });
    const second = await pi.post(`/api/proposals/${proposal.id}/members`, { email: invitee.email });
    expect(second.status).toBe(200);
    expect(second.body.id).toBe(first.body.id);
    const newToken = tokenIn((await h.mail.waitFor((m) => m.to.includes(invitee.email))).text, 'invitations')!;
    expect(newToken).not.toBe(oldToken);
    const b = await new Browser(h).signIn(invitee.email);
    expect((await b.post('/api/invitations/accept', { token: oldToken })).status).toBe(400);
    expect((await b.post('/api/invitations/accept', { token: newToken })).status).toBe(200);
    const dup = await pi.post(`/api/proposals/${proposal.id}/members`, { email: invitee.email });
    expect(dup.status).toBe(409);
    expect(dup.body.fieldErrors.email).toBeDefined();
    expect((await pi.post(`/api/proposals/${proposal.id}/members`, { email: piAccount.email })).status).toBe(409);
  });

  it('only the PI invites (co-I 403); a bad address is 400 on email; a bad token is 400', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const coi = await addCoInvestigator(h, pi, proposal.id);
    const refused = await coi.browser.post(`/api/proposals/${proposal.id}/members`, { email: 'x@test.example' });
    expect(refused.status).toBe(403);
    expect(refused.body.code).toBe('pi_only');
    const bad = await pi.post(`/api/proposals/${proposal.id}/members`, { email: 'not an address' });
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors.email).toBeDefined();
    const short = await pi.post('/api/invitations/accept', { token: 'short' });
    expect(short.status).toBe(400);
    const unknown = await pi.post('/api/invitations/accept', { token: 'x'.repeat(43) });
    expect(unknown.status).toBe(400);
    expect(unknown.body.code).toBe('invalid_invitation');
  });
});

describe('POST /api/proposals/:id/members: a reviewer invited as co-investigator', () => {
  it("warns of the conflict in this cycle's review and still sends the invitation (the facility's rules decide)", async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const cycleCode = (await h.created.ctx.db('cycles').where({ id: net.cycleId }).first('code')).code;
    const reviewer = await createAccount(h, ['proposer', 'reviewer']);
    const res = await pi.post(`/api/proposals/${proposal.id}/members`, { email: reviewer.email.toUpperCase() });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email: reviewer.email, role: 'coi', status: 'invited' });
    expect(res.body.warnings).toHaveLength(1);
    expect(res.body.warnings[0].code).toBe('reviewer_conflict');
    expect(res.body.warnings[0].message).toContain(`${reviewer.email} is a reviewer`);
    expect(res.body.warnings[0].message).toContain(`conflict of interest in the review of cycle ${cycleCode}`);
    expect(res.body.warnings[0].message).toContain("the facility's own rules");
    // It goes ahead: the mail is sent and the link works.
    const token = tokenIn((await h.mail.waitFor((m) => m.to.includes(reviewer.email))).text, 'invitations')!;
    const b = await new Browser(h).signIn(reviewer.email);
    expect((await b.post('/api/invitations/accept', { token })).status).toBe(200);
  });

  it('no warning for a proposer, nor for an address without an account', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const proposer = await createAccount(h, ['proposer', 'billing_contact']);
    const plain = await pi.post(`/api/proposals/${proposal.id}/members`, { email: proposer.email });
    expect(plain.status).toBe(201);
    expect(plain.body.warnings).toEqual([]);
    const stranger = await pi.post(`/api/proposals/${proposal.id}/members`, { email: `nobody-${Date.now()}@test.example` });
    expect(stranger.status).toBe(201);
    expect(stranger.body.warnings).toEqual([]);
  });

  it('inviting the reviewer again (a fresh link) warns again', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const reviewer = await createAccount(h, ['reviewer']);
    expect((await pi.post(`/api/proposals/${proposal.id}/members`, { email: reviewer.email })).body.warnings).toHaveLength(1);
    await h.created.ctx
      .db('proposal_invitation_mails')
      .where({ proposal_id: proposal.id })
      .update({ sent_at: new Date(Date.now() - 11 * 60_000) });
    const again = await pi.post(`/api/proposals/${proposal.id}/members`, { email: reviewer.email });
    expect(again.status).toBe(200);
    expect(again.body.warnings.map((w: { code: string }) => w.code)).toEqual(['reviewer_conflict']);
  });
});

describe('DELETE /api/proposals/:id/members/:memberId', () => {
  it('the PI removes a co-I (who then gets 404) or withdraws an invitation; the PI cannot be removed', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const coi = await addCoInvestigator(h, pi, proposal.id);
    const team = (await pi.get(`/api/proposals/${proposal.id}`)).body.team;
    const piMember = team.find((m: { role: string }) => m.role === 'pi');
    const refusedByCoi = await coi.browser.delete(`/api/proposals/${proposal.id}/members/${piMember.id}`);
    expect(refusedByCoi.status).toBe(403);
    const self = await pi.delete(`/api/proposals/${proposal.id}/members/${piMember.id}`);
    expect(self.status).toBe(409);
    expect(self.body.code).toBe('cannot_remove_pi');
    expect((await pi.delete(`/api/proposals/${proposal.id}/members/${coi.memberId}`)).status).toBe(204);
    expect((await coi.browser.get(`/api/proposals/${proposal.id}`)).status).toBe(404);
    expect((await pi.delete(`/api/proposals/${proposal.id}/members/${coi.memberId}`)).status).toBe(404);

    const pending = await pi.post(`/api/proposals/${proposal.id}/members`, { email: 'withdrawn@test.example' });
    const token = tokenIn((await h.mail.waitFor((m) => m.to.includes('withdrawn@test.example'))).text, 'sign-up')!;
    expect((await pi.delete(`/api/proposals/${proposal.id}/members/${pending.body.id}`)).status).toBe(204);
    const { browser } = await signedIn(h);
    expect((await browser.post('/api/invitations/accept', { token })).status).toBe(400);
  });
});
