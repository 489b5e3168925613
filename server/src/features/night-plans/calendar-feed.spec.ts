/**
 * Calendar subscription links of a node's night plan: the manager makes, replaces and stops a
 * link; the link serves the node's plan as iCalendar without a session; the secret is answered
 * once and appears in no other answer and in no audit row; every change has its audit row in
 * the same transaction. Visits are written straight in (no build is needed to read them).
 */
import { createHash } from 'node:crypto';
import request from 'supertest';
import type { AuditEntry } from '@spincycle/shared/awards/awards';
import type { CalendarFeedLink, CalendarFeedStatus } from '@spincycle/shared/night-plans/night-plans';
import { Browser, startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { account, browserFor, type Account } from '../awards/testing/award-fixtures';
import { createNightPlanFixture, fakeNightPlanQueue, insertVisit, type NightPlanFixture } from './testing/night-plan-fixtures';

let h: Harness;
let net: TestNetwork;
let f: NightPlanFixture;
let managerAccount: Account;
let manager: Browser;
const db = () => h.created.ctx.db;

const feedPath = (x: NightPlanFixture, node = 0) => `/api/night-plans/cycles/${x.cycleId}/nodes/${x.nodeIds[node]}/calendar-feed`;
/** The path of a feed address (the public address is http://spincycle.test/…, the harness's PUBLIC_URL). */
const pathOf = (url: string) => new URL(url).pathname;
/** A request with no cookie at all, as a calendar application makes it. */
const anonymous = (path: string) => request(h.created.app).get(path).buffer(true);
const textOf = (res: request.Response) => res.text ?? String(res.body);
const events = (ics: string) => ics.match(/BEGIN:VEVENT/g)?.length ?? 0;
const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');
const tokenOf = (url: string) => /\/api\/calendar-feeds\/([A-Za-z0-9_-]+)\.ics$/.exec(url)![1];

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  h.created.ctx.nightPlanQueue = fakeNightPlanQueue();
  net = await createTestNetwork(h, 'CF');
  managerAccount = await account(h, ['facility_manager'], 'Calendar Feed Manager');
  manager = await browserFor(h, managerAccount);
  // Two nodes: three visits on the first (two programs, three nights), one on the second.
  f = await createNightPlanFixture(h, net, {
    nodes: [net.nodes[0], net.nodes[2]],
    programs: [
      { targets: 2, hours: [5, 5] },
      { targets: 1, hours: [5, 0] },
    ],
    campaignNights: 10,
  });
  const nightAfter = (days: number) => new Date(Date.parse(`${f.campaignStart}T00:00:00Z`) + days * 86400_000).toISOString().slice(0, 10);
  await insertVisit(h, f, { program: 0, target: 0, node: 0 });
  await insertVisit(h, f, { program: 0, target: 1, node: 0, night: nightAfter(2) });
  await insertVisit(h, f, { program: 1, target: 0, node: 0, night: nightAfter(4) });
  await insertVisit(h, f, { program: 0, target: 0, node: 1, night: nightAfter(1) });
}, 60_000);
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

describe('a node’s calendar link', () => {
  let first: CalendarFeedLink;

  it('none at first: GET says so', async () => {
    const res = await manager.get(feedPath(f));
    expect(res.status).toBe(200);
    expect(res.body).toEqual<CalendarFeedStatus>({ active: false, createdAt: null, createdBy: null });
  });

  it('POST makes a link, answered once (201); only the SHA-256 of its secret is stored', async () => {
    const res = await manager.post(feedPath(f));
    expect(res.status).toBe(201);
    expect(res.headers['cache-control']).toBe('no-store');
    first = res.body;
    expect(first.url).toMatch(/^http:\/\/spincycle\.test\/api\/calendar-feeds\/[A-Za-z0-9_-]{43}\.ics$/);
    expect(Date.parse(first.createdAt)).not.toBeNaN();
    const token = tokenOf(first.url);
    const rows = await db()('calendar_feeds').where({ cycle_id: f.cycleId, node_id: f.nodeIds[0] });
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ token_hash: sha256(token), created_by: managerAccount.id, revoked_at: null });
    expect(JSON.stringify(rows)).not.toContain(token);
  });

  it('the link works without a session: the node’s visits as iCalendar, one event per visit, cacheable privately', async () => {
    const res = await anonymous(pathOf(first.url));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/calendar; charset=utf-8');
    expect(res.headers['cache-control']).toBe('private, max-age=300');
    // No session and no CSRF cookie is handed to a calendar application.
    expect(res.headers['set-cookie']).toBeUndefined();
    const ics = textOf(res);
    const visits = await db()('night_plan_visits').where({ cycle_id: f.cycleId, node_id: f.nodeIds[0] });
    expect(visits).toHaveLength(3);
    expect(events(ics)).toBe(visits.length);
    expect(ics).toContain(`SUMMARY:${f.targetNames[0][0]} (${f.titles[0]})`);
    expect(ics).toContain(`SUMMARY:${f.targetNames[1][0]} (${f.titles[1]})`);
    // The calendar's name says the cycle and the node; refresh hints for the application.
    expect(ics).toMatch(new RegExp(`X-WR-CALNAME:Night plan ${f.cycleCode} ${f.nodeCodes[0]}`));
    expect(ics).toContain('REFRESH-INTERVAL;VALUE=DURATION:PT1H');
    expect(ics).toContain('X-PUBLISHED-TTL:PT1H');
    // The same body as the manager's download.
    const download = await manager.get(`/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/plan.ics`).buffer(true);
    expect(textOf(download).replace(/DTSTAMP:\S+/g, '')).toBe(ics.replace(/DTSTAMP:\S+/g, ''));
  });

  it('follows the plan: a visit added later is in the next read', async () => {
    await insertVisit(h, f, { program: 1, target: 0, node: 0, night: f.campaignEnd });
    const res = await anonymous(pathOf(first.url));
    expect(events(textOf(res))).toBe(4);
  });

  it('GET says who made it and when, and never the link', async () => {
    const res = await manager.get(feedPath(f));
    expect(res.status).toBe(200);
    expect(res.body).toEqual<CalendarFeedStatus>({ active: true, createdAt: first.createdAt, createdBy: 'Calendar Feed Manager' });
    const token = tokenOf(first.url);
    expect(res.text).not.toContain(token);
    expect(res.text).not.toContain(sha256(token));
  });

  it('a wrong, malformed or half link answers 404 calendar_feed_not_found in the API error shape', async () => {
    const token = tokenOf(first.url);
    const wrong = `${token.slice(0, -1)}${token.endsWith('A') ? 'B' : 'A'}`;
    for (const path of [`/api/calendar-feeds/${wrong}.ics`, '/api/calendar-feeds/short.ics', `/api/calendar-feeds/${token}x.ics`]) {
      const res = await anonymous(path);
      expect({ path, status: res.status, code: res.body.code }).toEqual({ path, status: 404, code: 'calendar_feed_not_found' });
      expect(res.body.message).toEqual(expect.any(String));
    }
    // Without the extension it is no route at all.
    expect((await anonymous(`/api/calendar-feeds/${token}`)).status).toBe(404);
  });

  let second: CalendarFeedLink;

  it('a new link stops the previous one (404) in the same change; one link works', async () => {
    const res = await manager.post(feedPath(f));
    expect(res.status).toBe(201);
    second = res.body;
    expect(second.url).not.toBe(first.url);
    expect((await anonymous(pathOf(first.url))).status).toBe(404);
    expect((await anonymous(pathOf(second.url))).status).toBe(200);
    const rows = await db()('calendar_feeds').where({ cycle_id: f.cycleId, node_id: f.nodeIds[0] }).orderBy('id');
    expect(rows.map((r) => r.revoked_at === null)).toEqual([false, true]);
    expect(rows[0].revoked_by).toBe(managerAccount.id);
  });

  it('the other node’s link is its own: its visits only, and untouched by this node’s changes', async () => {
    const other = await manager.post(feedPath(f, 1));
    expect(other.status).toBe(201);
    const res = await anonymous(pathOf(other.body.url));
    expect(events(textOf(res))).toBe(1);
    expect(textOf(res)).toContain(`X-WR-CALNAME:Night plan ${f.cycleCode} ${f.nodeCodes[1]}`);
    expect((await anonymous(pathOf(second.url))).status).toBe(200);
  });

  it('DELETE stops the link (204): it answers 404, GET says none, a second DELETE is 404', async () => {
    const res = await manager.delete(feedPath(f));
    expect(res.status).toBe(204);
    expect((await anonymous(pathOf(second.url))).status).toBe(404);
    expect((await manager.get(feedPath(f))).body).toEqual({ active: false, createdAt: null, createdBy: null });
    const again = await manager.delete(feedPath(f));
    expect(again.status).toBe(404);
    expect(again.body.code).toBe('calendar_feed_not_found');
  });

  it('every change has its audit row: who, when, before and after, no reason, never the secret or its hash', async () => {
    const rows = await db()('audit_log').where({ cycle_id: f.cycleId, entity: 'calendar_feed' }).orderBy('id');
    expect(rows.map((r) => [r.action, r.actor_account_id, r.reason])).toEqual([
      ['make_link', managerAccount.id, null],
      ['replace_link', managerAccount.id, null],
      ['make_link', managerAccount.id, null],
      ['stop_link', managerAccount.id, null],
    ]);
    const day = first.createdAt.slice(0, 10);
    expect(rows[0]).toMatchObject({ before: null, after: { node: f.nodeCodes[0], link: 'new' } });
    expect(rows[1]).toMatchObject({ before: { node: f.nodeCodes[0], link: `made ${day}` }, after: { node: f.nodeCodes[0], link: 'new' } });
    expect(rows[2]).toMatchObject({ before: null, after: { node: f.nodeCodes[1], link: 'new' } });
    expect(rows[3]).toMatchObject({
      before: { node: f.nodeCodes[0], link: `made ${day}` },
      after: { node: f.nodeCodes[0], link: 'stopped' },
    });
    // Each row names the link it is about.
    const feedIds = (await db()('calendar_feeds').where('cycle_id', f.cycleId).orderBy('id')).map((r) => r.id);
    expect(rows.map((r) => r.entity_id)).toEqual([feedIds[0], feedIds[1], feedIds[2], feedIds[1]]);
    const stored = JSON.stringify(rows);
    const hashes = await db()('calendar_feeds').where('cycle_id', f.cycleId).pluck('token_hash');
    for (const url of [first.url, second.url]) expect(stored).not.toContain(tokenOf(url));
    for (const hash of hashes) expect(stored).not.toContain(hash);
    // The manager's audit log lists them.
    const log = await manager.get(`/api/awards/cycles/${f.cycleId}/audit`);
    expect(log.status).toBe(200);
    expect((log.body as AuditEntry[]).filter((e) => e.entity === 'calendar_feed')).toHaveLength(4);
    for (const url of [first.url, second.url]) expect(log.text).not.toContain(tokenOf(url));
  });
});

describe('refusals', () => {
  it('404 for an unknown cycle, an unknown node and a node the cycle does not offer, for every method', async () => {
    const paths = [
      `/api/night-plans/cycles/2147483000/nodes/${f.nodeIds[0]}/calendar-feed`,
      `/api/night-plans/cycles/${f.cycleId}/nodes/2147483000/calendar-feed`,
      // net.nodes[1] exists but this cycle does not offer it.
      `/api/night-plans/cycles/${f.cycleId}/nodes/${net.nodes[1].id}/calendar-feed`,
    ];
    const codes = ['cycle_not_found', 'node_not_found', 'node_not_found'];
    for (const [i, path] of paths.entries()) {
      for (const method of ['get', 'post', 'delete'] as const) {
        const res = await manager[method](path);
        expect({ path, method, status: res.status, code: res.body.code }).toEqual({ path, method, status: 404, code: codes[i] });
      }
    }
    expect(await db()('calendar_feeds').where('node_id', net.nodes[1].id)).toHaveLength(0);
  });

  it('signed out 401; a program’s PI and a reviewer 403, and nothing is made', async () => {
    const before = await db()('calendar_feeds').where('cycle_id', f.cycleId).count<{ n: number }[]>({ n: '*' });
    const signedOut = await new Browser(h).ready();
    for (const method of ['get', 'post', 'delete'] as const) {
      expect((await signedOut[method](feedPath(f))).status).toBe(401);
    }
    for (const who of [f.pis[0], f.reviewer]) {
      const b = await browserFor(h, who);
      for (const method of ['get', 'post', 'delete'] as const) {
        const res = await b[method](feedPath(f));
        expect({ method, status: res.status, code: res.body.code }).toEqual({ method, status: 403, code: 'forbidden' });
      }
    }
    const after = await db()('calendar_feeds').where('cycle_id', f.cycleId).count<{ n: number }[]>({ n: '*' });
    expect(after).toEqual(before);
  });
});

describe('two new links at once', () => {
  it('both are answered, one after the other: the later one works, the earlier one is stopped', async () => {
    const x = await createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [{ targets: 1, hours: [5] }], campaignNights: 5 });
    // Each insert of this cycle's links waits 300 ms, so that the two changes overlap: without the
    // node's lock both would find no working link and the second insert would break the
    // one-working-link index (a 500).
    const fn = `slow_feed_insert_${x.cycleId}`;
    await db().raw(`CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN IF NEW.cycle_id = ${x.cycleId} THEN PERFORM pg_sleep(0.3); END IF; RETURN NEW; END $$`);
    await db().raw(`CREATE TRIGGER ${fn} BEFORE INSERT ON calendar_feeds FOR EACH ROW EXECUTE FUNCTION ${fn}()`);
    let a, b;
    try {
      [a, b] = await Promise.all([manager.post(feedPath(x)), manager.post(feedPath(x))]);
    } finally {
      await db().raw(`DROP TRIGGER ${fn} ON calendar_feeds`);
      await db().raw(`DROP FUNCTION ${fn}()`);
    }
    expect([a.status, b.status]).toEqual([201, 201]);
    const rows = await db()('calendar_feeds').where('cycle_id', x.cycleId).orderBy('id');
    expect(rows.map((r) => r.revoked_at === null)).toEqual([false, true]);
    const working = [a, b].filter((r) => sha256(tokenOf(r.body.url)) === rows[1].token_hash);
    expect(working).toHaveLength(1);
    expect(await db()('audit_log').where({ cycle_id: x.cycleId, entity: 'calendar_feed' }).orderBy('id').pluck('action')).toEqual([
      'make_link',
      'replace_link',
    ]);
  });
});

describe('one transaction: a refused audit row leaves the links as they were', () => {
  it('a new link is not made and the working one keeps working', async () => {
    const x = await createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [{ targets: 1, hours: [5] }], campaignNights: 5 });
    await insertVisit(h, x);
    const made = await manager.post(feedPath(x));
    expect(made.status).toBe(201);
    // A trigger refuses this cycle's next calendar-link audit row (only its own: other tests write the log too).
    const fn = `refuse_feed_audit_${x.cycleId}`;
    await db().raw(`CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN IF NEW.cycle_id = ${x.cycleId} AND NEW.entity = 'calendar_feed' THEN RAISE EXCEPTION 'audit refused by the test'; END IF; RETURN NEW; END $$`);
    await db().raw(`CREATE TRIGGER ${fn} BEFORE INSERT ON audit_log FOR EACH ROW EXECUTE FUNCTION ${fn}()`);
    try {
      expect((await manager.post(feedPath(x))).status).toBe(500);
      expect((await manager.delete(feedPath(x))).status).toBe(500);
    } finally {
      await db().raw(`DROP TRIGGER ${fn} ON audit_log`);
      await db().raw(`DROP FUNCTION ${fn}()`);
    }
    const rows = await db()('calendar_feeds').where('cycle_id', x.cycleId);
    expect(rows).toHaveLength(1);
    expect(rows[0].revoked_at).toBeNull();
    expect((await anonymous(pathOf(made.body.url))).status).toBe(200);
    expect(await db()('audit_log').where({ cycle_id: x.cycleId, entity: 'calendar_feed' }).pluck('action')).toEqual(['make_link']);
  });
});
