/**
 * Every place that mails writes its outbox row in the transaction of the change that causes
 * it: a committed change has its mail (handed to the relay right after the commit, here the
 * harness's SMTP fake), and a change whose mail cannot be written is not made. The mail is
 * refused by a trigger on `mail_outbox` that matches only this test's marker (a recipient or a
 * subject), so suites running in parallel on the shared database are not affected.
 */
import { randomUUID } from 'node:crypto';
import type { ReleaseResult } from '@spincycle/shared/awards/awards';
import { Browser, createAccount, signedIn, startHarness, type Harness } from '../../../test/support/api-harness';
import { createTestNetwork, makeReady, proposerWithDraft, type TestNetwork } from '../../../test/api/support/proposal-kit';
import { account, browserFor, createAwardFixture, decideAll } from '../features/awards/testing/award-fixtures';
import { requestPasswordReset, signUp } from '../features/auth/auth-service';
import { closeCall as closePanelCall, insertProposal, insertReviewer } from '../features/review/panels/testing/panel-fixtures';
import { assign, closeCall, submittedProposal } from '../features/review/reviewing/testing/review-fixtures';
import { SECRET_BODY_REMOVED, sweepOutbox } from './outbox';

let h: Harness;
let net: TestNetwork;
let manager: Browser;
const tag = randomUUID().slice(0, 8);

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  net = await createTestNetwork(h, 'MO');
  manager = await browserFor(h, await account(h, ['facility_manager'], `Mail Outbox Manager ${tag}`));
}, 60_000);
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const db = () => h.created.ctx.db;

interface OutboxRow {
  id: number;
  kind: string;
  to_addresses: string[];
  subject: string;
  text_body: string;
  state: string;
  attempts: number;
  message_id: string;
  holds_secret: boolean;
}

/** The outbox rows addressed to someone. */
async function rowsTo(email: string): Promise<OutboxRow[]> {
  return db()('mail_outbox').whereRaw('? = ANY(to_addresses)', [email]).orderBy('id');
}

/** The one row addressed to someone, after it was handed to the fake (received there once). */
async function deliveredTo(email: string, kind: string): Promise<OutboxRow> {
  const rows = await rowsTo(email);
  expect(rows.map((r) => [r.kind, r.state])).toEqual([[kind, 'sent']]);
  const received = await h.mail.waitFor((m) => m.messageId === rows[0].message_id);
  expect(received.to).toContain(email);
  expect(h.mail.messages().filter((m) => m.messageId === rows[0].message_id)).toHaveLength(1);
  return rows[0];
}

/** Runs `work` while the outbox refuses any mail whose recipients or subject contain `marker`. */
async function whileMailRefused<T>(marker: string, work: () => Promise<T>): Promise<T> {
  if (!/^[A-Za-z0-9@.#() -]+$/.test(marker)) throw new Error(`unsafe marker ${marker}`);
  const fn = `refuse_mail_${randomUUID().replace(/-/g, '').slice(0, 16)}`;
  await db().raw(`CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF position('${marker}' in array_to_string(NEW.to_addresses, ' ') || ' ' || NEW.subject) > 0 THEN
        RAISE EXCEPTION 'mail refused by the test';
      END IF;
      RETURN NEW;
    END $$`);
  await db().raw(`CREATE TRIGGER ${fn} BEFORE INSERT ON mail_outbox FOR EACH ROW EXECUTE FUNCTION ${fn}()`);
  try {
    return await work();
  } finally {
    await db().raw(`DROP TRIGGER ${fn} ON mail_outbox`);
    await db().raw(`DROP FUNCTION ${fn}()`);
  }
}

const uniqueEmail = (what: string) => `outbox-${what}-${tag}-${randomUUID().slice(0, 6)}@test.example`;

describe('sign-up', () => {
  it('a new account and its welcome mail commit together; when the mail cannot be written there is no account', async () => {
    const email = uniqueEmail('welcome');
    await signUp(h.created.ctx, { email, password: 'quiet harbour lantern 42', displayName: 'Outbox Welcome', affiliation: '' });
    expect(await db()('accounts').where({ email }).first('id')).toBeDefined();
    const row = await deliveredTo(email, 'welcome');
    expect(row.subject).toBe('Welcome to Spincycle');

    const refused = uniqueEmail('welcome-refused');
    await expect(
      whileMailRefused(refused, () =>
        signUp(h.created.ctx, { email: refused, password: 'quiet harbour lantern 42', displayName: 'Outbox Refused', affiliation: '' }),
      ),
    ).rejects.toThrow(/mail refused by the test/);
    expect(await db()('accounts').where({ email: refused }).first('id')).toBeUndefined();
    expect(await rowsTo(refused)).toEqual([]);
  });

  it('an address that has an account gets the sign-up attempt mail', async () => {
    const existing = await createAccount(h, ['proposer']);
    await signUp(h.created.ctx, { email: existing.email, password: 'quiet harbour lantern 42', displayName: 'Someone', affiliation: '' });
    expect((await deliveredTo(existing.email, 'sign_up_attempt')).subject).toBe('Someone tried to sign up to Spincycle with your address');
  });
});

describe('password reset', () => {
  it('the reset token and its mail commit together; the sent body no longer holds the link', async () => {
    const a = await createAccount(h, ['proposer']);
    await requestPasswordReset(h.created.ctx, a.email);
    const row = await deliveredTo(a.email, 'password_reset');
    expect(row.holds_secret).toBe(true);
    expect(row.text_body).toBe(SECRET_BODY_REMOVED);
    const received = h.mail.messages().find((m) => m.messageId === row.message_id)!;
    expect(received.text).toMatch(/reset-password\?token=[A-Za-z0-9_-]+/);
    expect(await db()('password_reset_tokens').where({ account_id: a.id }).count({ n: '*' })).toEqual([{ n: 1 }]);

    const b = await createAccount(h, ['proposer']);
    await expect(whileMailRefused(b.email, () => requestPasswordReset(h.created.ctx, b.email))).rejects.toThrow(/mail refused/);
    expect(await db()('password_reset_tokens').where({ account_id: b.id }).count({ n: '*' })).toEqual([{ n: 0 }]);
  });
});

describe('invitation to a proposal team', () => {
  it('the invitation and its mail commit together; a refused mail leaves no invitation (500, nothing written)', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, `Outbox invitation ${tag}`);
    const invitee = uniqueEmail('invitee');
    expect((await pi.post(`/api/proposals/${proposal.id}/members`, { email: invitee })).status).toBe(201);
    const row = await deliveredTo(invitee, 'invitation');
    expect(row).toMatchObject({ holds_secret: true, text_body: SECRET_BODY_REMOVED });

    const refused = uniqueEmail('invitee-refused');
    const res = await whileMailRefused(refused, () => pi.post(`/api/proposals/${proposal.id}/members`, { email: refused }));
    expect(res.status).toBe(500);
    expect(await db()('proposal_members').where({ proposal_id: proposal.id, email: refused }).first('id')).toBeUndefined();
    expect(await db()('proposal_invitation_mails').where({ proposal_id: proposal.id, email: refused }).first()).toBeUndefined();
  });
});

describe('submission receipt', () => {
  it('the submission and its receipt commit together; a refused receipt leaves the proposal a draft', async () => {
    const made = await proposerWithDraft(h, net.cycleId, `Outbox submission ${tag}`);
    await makeReady(h, made.browser, made.proposal.id, [net.nodeIds[0]]);
    expect((await made.browser.post(`/api/proposals/${made.proposal.id}/submit`)).status).toBe(200);
    expect((await deliveredTo(made.account.email, 'submission')).subject).toBe(
      `Proposal submitted: “Outbox submission ${tag}” (${net.cycleCode})`,
    );

    const other = await proposerWithDraft(h, net.cycleId, `Outbox refused submission ${tag}`);
    await makeReady(h, other.browser, other.proposal.id, [net.nodeIds[0]]);
    const res = await whileMailRefused(other.account.email, () => other.browser.post(`/api/proposals/${other.proposal.id}/submit`));
    expect(res.status).toBe(500);
    expect(await db()('proposals').where({ id: other.proposal.id }).first('state', 'submitted_at')).toEqual({
      state: 'draft',
      submitted_at: null,
    });
    expect(await rowsTo(other.account.email)).toEqual([]);
  });
});

describe('conflict declared by a reviewer', () => {
  it('the conflict and the managers’ mail commit together; a refused mail leaves the assignment in place', async () => {
    const cycle = await net.createCycle();
    const ok = await submittedProposal(h, cycle.id, [net.nodeIds[0]], `Outbox conflict ${tag}`);
    const kept = await submittedProposal(h, cycle.id, [net.nodeIds[0]], `Outbox kept assignment ${tag}`);
    await closeCall(h, cycle.id);
    const reviewer = await signedIn(h, ['reviewer']);
    await assign(h, ok.id, reviewer.account.id);
    await assign(h, kept.id, reviewer.account.id);

    const res = await reviewer.browser.post(`/api/review/my/${ok.id}/conflict`, { reason: 'Former colleague of the PI' });
    expect(res.status).toBe(201);
    const [row] = await db()('mail_outbox').where('subject', `Conflict declared: proposal #${ok.id} (${cycle.code})`);
    expect(row).toMatchObject({ kind: 'conflict_declared', state: 'sent' });
    await h.mail.waitFor((m) => m.messageId === row.message_id);

    const refused = await whileMailRefused(`proposal #${kept.id} (`, () =>
      reviewer.browser.post(`/api/review/my/${kept.id}/conflict`, { reason: 'Former colleague of the PI' }),
    );
    expect(refused.status).toBe(500);
    expect(await db()('review_conflicts').where({ proposal_id: kept.id, reviewer_account_id: reviewer.account.id })).toEqual([]);
    expect(await db()('review_assignments').where({ proposal_id: kept.id, reviewer_account_id: reviewer.account.id })).toHaveLength(1);
  }, 60_000);
});

describe('review assignment', () => {
  async function panelWith(reviewerIds: number[]) {
    const cycle = await net.createCycle();
    await closePanelCall(h, cycle.id);
    const proposal = await insertProposal(h, cycle.id, { title: `Outbox assignment ${tag}` });
    const panel = await manager.post(`/api/review/cycles/${cycle.id}/panels`, {
      name: `Outbox panel ${tag} ${randomUUID().slice(0, 4)}`,
      memberIds: reviewerIds,
      chairId: reviewerIds[0],
    });
    expect(panel.status).toBe(201);
    expect((await manager.put(`/api/review/panels/${panel.body.id}/proposals`, { proposalIds: [proposal.id] })).status).toBe(200);
    return { panelId: panel.body.id as number, proposalId: proposal.id };
  }

  it('the assignment and the reviewer’s mail commit together; notified_at is set when it is sent; a refused mail leaves no assignment', async () => {
    const r = await insertReviewer(h);
    const { panelId, proposalId } = await panelWith([r.id]);
    const res = await manager.put(`/api/review/panels/${panelId}/assignments`, { proposalId, reviewerId: r.id, assigned: true });
    expect(res.status).toBe(200);
    await deliveredTo(r.email, 'review_assignment');
    expect((await db()('review_assignments').where({ proposal_id: proposalId }).first('notified_at')).notified_at).not.toBeNull();

    const other = await insertReviewer(h);
    const second = await panelWith([other.id]);
    const refused = await whileMailRefused(other.email, () =>
      manager.put(`/api/review/panels/${second.panelId}/assignments`, {
        proposalId: second.proposalId,
        reviewerId: other.id,
        assigned: true,
      }),
    );
    expect(refused.status).toBe(500);
    expect(await db()('review_assignments').where({ proposal_id: second.proposalId })).toEqual([]);
  });

  it('with the relay down the assignment stands, unnotified; the worker’s sweep sends the mail later and marks it notified', async () => {
    const r = await insertReviewer(h);
    const { panelId, proposalId } = await panelWith([r.id]);
    const real = h.created.ctx.mailer;
    h.created.ctx.mailer = { send: () => Promise.reject(new Error('relay down')), close: () => undefined };
    try {
      const res = await manager.put(`/api/review/panels/${panelId}/assignments`, { proposalId, reviewerId: r.id, assigned: true });
      expect(res.status).toBe(200);
    } finally {
      h.created.ctx.mailer = real;
    }
    expect((await db()('review_assignments').where({ proposal_id: proposalId }).first('notified_at')).notified_at).toBeNull();
    const [row] = await rowsTo(r.email);
    expect(row).toMatchObject({ kind: 'review_assignment', state: 'pending', attempts: 1 });
    // Its next attempt comes (the wait is over), and the worker sweeps.
    await db()('mail_outbox').where({ id: row.id }).update({ next_attempt_at: db().fn.now() });
    const swept = await sweepOutbox(h.created.ctx);
    expect(swept.sent).toContain(row.id);
    await deliveredTo(r.email, 'review_assignment');
    expect((await db()('review_assignments').where({ proposal_id: proposalId }).first('notified_at')).notified_at).not.toBeNull();
  });
});

describe('award decisions', () => {
  it('the release and each team’s mail commit together; mailed_at is set as each is sent; a refused mail leaves the cycle unreleased', async () => {
    const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]], [[{ node: 0, hours: 10 }]]] });
    await decideAll(manager, h, f, { 0: { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] } });
    const refused = await whileMailRefused(f.pis[1].email, () =>
      manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true }),
    );
    expect(refused.status).toBe(500);
    expect((await db()('cycles').where({ id: f.cycleId }).first('awards_released_at')).awards_released_at).toBeNull();
    expect(await db()('proposals').whereIn('id', f.proposalIds).orderBy('id').pluck('state')).toEqual(['ranked', 'ranked']);
    expect(await rowsTo(f.pis[0].email)).toEqual([]);

    const res = await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true });
    expect(res.status).toBe(200);
    expect(res.body as ReleaseResult).toMatchObject({ mailed: 2, mailFailures: 0 });
    for (const pi of f.pis) await deliveredTo(pi.email, 'decision');
    expect(await db()('awards').whereIn('proposal_id', f.proposalIds).whereNull('mailed_at').count({ n: '*' })).toEqual([{ n: 0 }]);
  });

  it('a decision changed after the release mails the team in its transaction; with the relay down the mail waits and mailed_at follows its sending', async () => {
    const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]]] });
    await decideAll(manager, h, f, { 0: { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] } });
    expect((await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true })).status).toBe(200);
    await deliveredTo(f.pis[0].email, 'decision');

    const real = h.created.ctx.mailer;
    h.created.ctx.mailer = { send: () => Promise.reject(new Error('relay down')), close: () => undefined };
    try {
      const version = (await db()('awards').where('proposal_id', f.proposalIds[0]).first('version')).version;
      const res = await manager.put(`/api/awards/proposals/${f.proposalIds[0]}`, {
        version,
        outcome: 'not_awarded',
        nodes: [],
        targetIds: null,
        overrideReason: null,
      });
      expect(res.status).toBe(200);
    } finally {
      h.created.ctx.mailer = real;
    }
    const rows = await rowsTo(f.pis[0].email);
    expect(rows.map((r) => [r.kind, r.state])).toEqual([
      ['decision', 'sent'],
      ['decision', 'pending'],
    ]);
    expect(rows[1].text_body).toContain('has changed');
    await db()('mail_outbox').where({ id: rows[1].id }).update({ next_attempt_at: db().fn.now() });
    const before = (await db()('awards').where('proposal_id', f.proposalIds[0]).first('mailed_at')).mailed_at as Date;
    expect((await sweepOutbox(h.created.ctx)).sent).toContain(rows[1].id);
    const after = (await db()('awards').where('proposal_id', f.proposalIds[0]).first('mailed_at')).mailed_at as Date;
    expect(after.getTime()).toBeGreaterThan(before.getTime());
  });
});
