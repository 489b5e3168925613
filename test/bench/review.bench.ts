/**
 * Review under load (`npm run bench -- review`): a cycle of 2000 submitted proposals (5 targets
 * each, with their stored plans) and 60 reviewers in 10 panels of 200 proposals and 6 members,
 * 3 reviewers per proposal (a load of 100 each).
 * 1. Automatic assignment: the solver alone on the whole cycle as one problem (2000 proposals,
 *    60 reviewers, k = 3, one in ten pairs ineligible, expertise preferred) — best and median of
 *    5 runs — and `POST …/assign-automatically` for each of the 10 panels over HTTP (database
 *    reads and writes included; the assignment mails fail fast, no SMTP server listens).
 *    Target: ≤ 2 s for 2000 proposals.
 * 2. The reviewer's table (`GET /api/review/my`, 100 rows) and a panel's matrix
 *    (`GET /api/review/panels/:id/matrix`, 200 × 6) at 200 requests per second for 30 s
 *    (BENCH_API_SECONDS) from autocannon over loopback, against a web server of its own, in
 *    two arrival patterns: paced (evenly spaced requests from 200 clients) and bursts (each
 *    second's 200 requests at once on 20 connections); see api-load.ts.
 *    Target: p95 ≤ 50 ms with 0 errors.
 * Creates throw-away rows and deletes them at the end.
 *
 * BENCH_REVIEW_KEEP=1 keeps the rows at the end (for timing single requests and EXPLAIN ANALYZE
 * on them) and records them in /tmp/review-bench-kept.json (cycle, accounts with their e-mails
 * and the password, panels); a later run with BENCH_REVIEW_KEEP=1 reuses the recorded rows
 * instead of seeding (no solver run, no automatic assignment). BENCH_REVIEW_KEEP=drop deletes
 * the recorded rows and the file, and measures nothing. Kept rows are yours to drop.
 */
import { randomUUID } from 'node:crypto';
import { existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import type { Knex } from 'knex';
import { stopChild } from '../../server/scripts/processes.cjs';
import { createApp } from '../../server/src/app';
import type { AppContext } from '../../server/src/app-context';
import { insertAccount } from '../../server/src/features/accounts/account-repository';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plans/plan-service';
import { uploadTargets } from '../../server/src/features/proposals/targets/target-service';
import { assignReviewers } from '../../shared/src/review/assignment';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { freePort, load, RATE, SECONDS, signIn, startMeasuredServer } from './support/api-load';
import { bringUpBenchDatabase, createBenchNetwork, emptyBenchRows, removeBenchRows, type BenchRows } from './support/bench-network';

const PROPOSALS = 2000;
const REVIEWERS = 60;
const PANELS = 10;
/** Proposals per panel. */
const PER_PANEL = PROPOSALS / PANELS;
const K = 3;
const PASSWORD = 'a bench password 123';
const CATEGORIES = ['Open clusters', 'Field stars', 'Methods'];

const TARGETS_CSV = [
  'name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,notes',
  'Star R-1,10.5,20.1,11.2,V,1.1,BPRP,,800,120,,',
  'Star R-2,80.2,-10.4,12.4,V,1.6,BPRP,,1500,300,,',
  'Star R-3,150.9,35.7,10.1,V,0.9,BPRP,,650,60,,',
  'Star R-4,220.3,5.2,13.3,V,2.1,BPRP,,3000,800,,',
  'Star R-5,300.8,-25.6,9.8,V,0.8,BPRP,,400,50,,',
].join('\n');

const ms = (v: number) => `${v.toFixed(0)} ms`;

/** BENCH_REVIEW_KEEP: `1` keeps (and reuses) the seeded rows, `drop` deletes kept ones. */
const KEEP = process.env.BENCH_REVIEW_KEEP;
const KEPT_FILE = '/tmp/review-bench-kept.json';

/** What a run with BENCH_REVIEW_KEEP=1 leaves behind. */
interface KeptRows {
  tag: string;
  made: BenchRows;
  accounts: number[];
  panelIds: number[];
  reviewerEmail: string;
  managerEmail: string;
  password: string;
}

async function dropRows(db: Knex, made: BenchRows, accounts: number[]): Promise<void> {
  if (made.cycle) await db('proposals').where({ cycle_id: made.cycle }).del();
  await removeBenchRows(db, { ...made, proposal: 0 });
  if (accounts.length) await db('accounts').whereIn('id', accounts).del();
}

/** The solver alone on the whole cycle: best and median of 5 runs. */
function benchSolver(): void {
  const r = seededRandom(2000);
  const proposals = Array.from({ length: PROPOSALS }, (_, i) => ({ id: i + 1 }));
  const reviewers = Array.from({ length: REVIEWERS }, (_, i) => ({ id: 10_000 + i }));
  const blocked = new Set<string>();
  for (const p of proposals) for (const v of reviewers) if (r.next() < 0.1) blocked.add(`${p.id}:${v.id}`);
  const category = (id: number) => CATEGORIES[id % 3];
  const expertise = (id: number) => [CATEGORIES[id % 3], CATEGORIES[(id + 1) % 3]];
  const times: number[] = [];
  let assigned = 0;
  for (let run = 0; run < 5; run++) {
    const t0 = performance.now();
    const result = assignReviewers({
      proposals,
      reviewers,
      reviewersPerProposal: K,
      fixed: [],
      eligible: (p, v) => !blocked.has(`${p}:${v}`),
      prefers: (p, v) => expertise(v).includes(category(p)),
    });
    times.push(performance.now() - t0);
    if (!result.ok) throw new Error('the bench problem should be feasible');
    assigned = result.assignments.length;
  }
  times.sort((a, b) => a - b);
  console.log(
    `solver, ${PROPOSALS} proposals × ${REVIEWERS} reviewers, k = ${K}, 10 % ineligible: best ${ms(times[0])}, median ${ms(times[2])} (${assigned} assignments); target ≤ 2 s`,
  );
}

const managerEmailOf = (tag: string) => `${tag.toLowerCase()}-m@bench.example`;
const reviewerEmailOf = (tag: string) => `${tag.toLowerCase()}-r0@bench.example`;

/**
 * The cycle, its 2000 proposals with plans, the reviewers and the manager (into `made` and
 * `accounts` as they are made), the panels over HTTP, their automatic assignment and some grades.
 */
async function seed(ctx: AppContext, base: string, tag: string, made: BenchRows, accounts: number[], panelIds: number[]): Promise<void> {
  const db = ctx.db;
  const passwordHash = await hashPassword(PASSWORD);
  const { viewer, proposalId: template } = await createBenchNetwork(ctx, made, {
    tag,
    passwordHash,
    sites: ['N', 'S'],
    siteOfNode: [0, 0, 1],
  });
  await uploadTargets(
    ctx,
    viewer,
    template,
    { buffer: Buffer.from(TARGETS_CSV), originalname: 'bench.csv' } as Express.Multer.File,
    () => 'replace',
  );
  await computeAndStoreProposalPlans(db, template);

  const t0 = performance.now();
  // Reviewers (affiliations of their own), a manager, and the cycle closed with a deadline ahead.
  for (let i = 0; i < REVIEWERS; i++) {
    accounts.push(
      await insertAccount(db, {
        email: i === 0 ? reviewerEmailOf(tag) : `${tag.toLowerCase()}-r${i}@bench.example`,
        displayName: `Bench Reviewer ${i}`,
        affiliation: `Bench Institute ${i}`,
        passwordHash,
        roles: ['reviewer'],
      }),
    );
  }
  const managerEmail = managerEmailOf(tag);
  accounts.push(
    await insertAccount(db, {
      email: managerEmail,
      displayName: 'Bench Manager',
      affiliation: '',
      passwordHash,
      roles: ['facility_manager'],
    }),
  );
  await db('accounts')
    .whereIn('id', accounts.slice(0, REVIEWERS))
    .update({ expertise: db.raw("ARRAY[(ARRAY['Open clusters','Field stars','Methods'])[1 + id % 3]]") });
  const now = Date.now();
  await db('cycles')
    .where({ id: made.cycle })
    .update({
      call_opens_at: new Date(now - 30 * 86400_000),
      call_closes_at: new Date(now - 86400_000),
      review_deadline: new Date(now + 14 * 86400_000),
      reviewers_per_proposal: K,
      categories: CATEGORIES,
    });
  await db('proposals').where({ id: template }).update({ state: 'submitted', submitted_at: db.fn.now(), category: CATEGORIES[0] });

  // The other 1999 proposals: copies of the template with its team, nodes, targets and plans.
  await db.raw(
    `WITH src AS (SELECT * FROM proposals WHERE id = ?),
     made AS (
       INSERT INTO proposals (cycle_id, pi_account_id, title, abstract, category, state, submitted_at, completeness)
       SELECT src.cycle_id, src.pi_account_id, 'Bench proposal ' || g, src.abstract, (ARRAY['Open clusters','Field stars','Methods'])[1 + g % 3],
              'submitted', now(), src.completeness
       FROM src, generate_series(2, ?) g RETURNING id)
     SELECT count(*) FROM made`,
    [template, PROPOSALS],
  );
  const copies = db('proposals').where({ cycle_id: made.cycle }).whereNot({ id: template }).select('id');
  await db.raw(
    `INSERT INTO proposal_members (proposal_id, account_id, email, role, accepted_at)
     SELECT c.id, m.account_id, m.email, m.role, m.accepted_at FROM (${copies.toQuery()}) c JOIN proposal_members m ON m.proposal_id = ?`,
    [template],
  );
  await db.raw(
    `INSERT INTO proposal_nodes (proposal_id, node_id) SELECT c.id, n.node_id FROM (${copies.toQuery()}) c JOIN proposal_nodes n ON n.proposal_id = ?`,
    [template],
  );
  const targetColumns =
    'name, ra_deg, dec_deg, magnitude, magnitude_band, colour, colour_system, reddening_ebv, age_myr, age_uncertainty_myr, period_precision_days, notes, period_days, period_uncertainty_days';
  await db.raw(
    `INSERT INTO targets (proposal_id, position, ${targetColumns})
     SELECT c.id, t.position, ${targetColumns.replace(/(\w+)/g, 't.$1')} FROM (${copies.toQuery()}) c JOIN targets t ON t.proposal_id = ?`,
    [template],
  );
  await db.raw(
    `INSERT INTO target_plans (target_id, node_id, proposal_id, inputs_hash, feasible, node_hours, fee_minor, currency, result, error, computed_at, summary)
     SELECT nt.id, tp.node_id, nt.proposal_id, tp.inputs_hash, tp.feasible, tp.node_hours, tp.fee_minor, tp.currency, tp.result, tp.error, tp.computed_at, tp.summary
     FROM target_plans tp JOIN targets ot ON ot.id = tp.target_id
     JOIN targets nt ON nt.position = ot.position AND nt.proposal_id IN (${copies.toQuery()})
     WHERE tp.proposal_id = ?`,
    [template],
  );
  // Every proposal has its plan run row from its creation on (createProposal); the copies get the template's.
  await db.raw(
    `INSERT INTO plan_runs (proposal_id, state, total, done, requested_at, started_at, finished_at, error, inputs_hash,
                            inputs_version, current_hash, current_hash_model, plans_version)
     SELECT c.id, r.state, r.total, r.done, r.requested_at, r.started_at, r.finished_at, r.error, r.inputs_hash,
            r.inputs_version, r.current_hash, r.current_hash_model, r.plans_version
     FROM (${copies.toQuery()}) c JOIN plan_runs r ON r.proposal_id = ?`,
    [template],
  );
  const proposalIds: number[] = (await db('proposals').where({ cycle_id: made.cycle }).orderBy('id').select('id')).map(
    (p: { id: number }) => p.id,
  );
  console.log(
    `seeded ${proposalIds.length} submitted proposals with 5 targets and their plans each, ${REVIEWERS} reviewers, in ${ms(performance.now() - t0)}`,
  );

  // Panels over HTTP as the manager: 10 panels of 6 reviewers, 200 proposals each, then automatic assignment.
  const managerCookie = await signIn(base, managerEmail, PASSWORD);
  const call = async (method: string, path: string, body?: unknown) => {
    const res = await fetch(`${base}${path}`, {
      method,
      headers: {
        cookie: managerCookie,
        'content-type': 'application/json',
        'x-xsrf-token': decodeURIComponent(/XSRF-TOKEN=([^;]+)/.exec(managerCookie)?.[1] ?? ''),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${await res.text()}`);
    return res.json();
  };
  for (let p = 0; p < PANELS; p++) {
    const members = accounts.slice(p * 6, p * 6 + 6);
    const panel = await call('POST', `/api/review/cycles/${made.cycle}/panels`, {
      name: `Bench panel ${p + 1}`,
      memberIds: members,
      chairId: members[0],
    });
    panelIds.push(panel.id);
    await call('PUT', `/api/review/panels/${panel.id}/proposals`, { proposalIds: proposalIds.slice(p * PER_PANEL, (p + 1) * PER_PANEL) });
  }
  const assignTimes: number[] = [];
  let added = 0;
  for (const id of panelIds) {
    const t = performance.now();
    added += (await call('POST', `/api/review/panels/${id}/assign-automatically`)).added;
    assignTimes.push(performance.now() - t);
  }
  const total = assignTimes.reduce((a, b) => a + b, 0);
  assignTimes.sort((a, b) => a - b);
  console.log(
    `POST …/assign-automatically over HTTP, ${PANELS} panels of ${PER_PANEL} proposals × 6 reviewers: ${added} assignments, ${ms(total)} in all (median panel ${ms(assignTimes[PANELS / 2])}, slowest ${ms(assignTimes[PANELS - 1])}); target ≤ 2 s for 2000 proposals`,
  );

  // Some grades, so that the table and the matrix carry them.
  await db.raw(
    `UPDATE review_assignments SET grade = round((3 + (id % 70) / 10.0)::numeric, 1), saved_at = now()
     WHERE id % 2 = 0 AND proposal_id IN (SELECT id FROM proposals WHERE cycle_id = ?)`,
    [made.cycle],
  );
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  await bringUpBenchDatabase(database);
  const created = createApp({
    config: { PGDATABASE: database, LOG_LEVEL: 'silent', NODE_ENV: 'test', SMTP_PORT: 1, PUBLIC_URL: 'http://127.0.0.1' },
    ctx: { planQueue: { enqueue: async () => undefined, close: async () => undefined } },
  });
  const { ctx } = created;
  const db = ctx.db;
  const recorded = KEEP && existsSync(KEPT_FILE) ? (JSON.parse(readFileSync(KEPT_FILE, 'utf8')) as KeptRows) : undefined;
  if (KEEP === 'drop') {
    if (recorded) {
      await dropRows(db, recorded.made, recorded.accounts);
      rmSync(KEPT_FILE);
      console.log(`dropped the kept rows of ${recorded.tag}`);
    } else console.log(`no kept rows (${KEPT_FILE} does not exist)`);
    await created.close();
    return;
  }
  const kept = recorded && (await db('cycles').where({ id: recorded.made.cycle }).first('id')) ? recorded : undefined;
  if (!kept) benchSolver();
  const tag = kept?.tag ?? `RVB${Date.now().toString(36).toUpperCase()}`;
  const made = kept?.made ?? emptyBenchRows();
  const accounts = kept?.accounts ?? [];
  const panelIds = kept?.panelIds ?? [];
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = await startMeasuredServer(database, port, `review-bench-${randomUUID()}`);
  try {
    if (kept) console.log(`reusing the rows kept in ${KEPT_FILE} (${tag})`);
    else await seed(ctx, base, tag, made, accounts, panelIds);
    const managerCookie = await signIn(base, managerEmailOf(tag), PASSWORD);
    const reviewerCookie = await signIn(base, reviewerEmailOf(tag), PASSWORD);
    const rows = (await (await fetch(`${base}/api/review/my`, { headers: { cookie: reviewerCookie } })).json()) as { reviews: unknown[] };
    console.log(
      `${RATE} req/s for ${SECONDS} s per endpoint, autocannon over loopback; the reviewer's table has ${rows.reviews.length} rows`,
    );
    await load(base, "GET /api/review/my (reviewer's table)", '/api/review/my', reviewerCookie, server.pid!);
    await load(base, `GET …/panels/:id/matrix (${PER_PANEL} × 6)`, `/api/review/panels/${panelIds[0]}/matrix`, managerCookie, server.pid!);
    console.log('target: p95 ≤ 50 ms with 0 errors');
  } finally {
    await stopChild(server);
    if (KEEP === '1') {
      const keptRows: KeptRows = {
        tag,
        made,
        accounts,
        panelIds,
        reviewerEmail: reviewerEmailOf(tag),
        managerEmail: managerEmailOf(tag),
        password: PASSWORD,
      };
      writeFileSync(KEPT_FILE, JSON.stringify(keptRows, null, 2));
      console.log(`kept the rows of ${tag} (${KEPT_FILE}); BENCH_REVIEW_KEEP=drop deletes them`);
    } else await dropRows(db, made, accounts);
    await created.close();
  }
}
