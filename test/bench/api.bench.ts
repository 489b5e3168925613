/**
 * API latency under load: GET /api/proposals and the plans list of a 60-target proposal on
 * 3 nodes (180 plans; `?pageSize=200` so that the whole list comes back, as before the list
 * was paged, and the default first page), plus the run status the plans tab polls. Each at a
 * fixed 200 requests per second for 30 s (BENCH_API_SECONDS to change it) from autocannon over
 * loopback (after 3 s of the same load, not counted), in two arrival patterns (paced: evenly
 * spaced requests from 200 clients; bursts: each second's 200 requests at once on 20
 * connections — see api-load.ts), against a web server of its own on the test database. The server runs as
 * `npm start` runs it — its own process (server/src/server.ts), logging at info — so that the
 * load generator's own work does not share its event loop. Prints p50/p95/p99 and errors;
 * target: p95 ≤ 50 ms with 0 errors (read on the paced pattern). Creates throw-away rows and deletes them at the end.
 */
import { randomUUID } from 'node:crypto';
import { stopChild } from '../../server/scripts/processes.cjs';
import { createApp } from '../../server/src/app';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plans/plan-service';
import { uploadTargets } from '../../server/src/features/proposals/targets/target-service';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { freePort, load, RATE, SECONDS, signIn, startMeasuredServer } from './support/api-load';
import { bringUpBenchDatabase, createBenchNetwork, emptyBenchRows, removeBenchRows } from './support/bench-network';

const TARGETS = 60;
const PASSWORD = 'a bench password 123';

function generateCsv(count: number): string {
  const r = seededRandom(60);
  const lines = ['name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,notes'];
  for (let i = 0; i < count; i++) {
    const age = r.uniform(300, 6000);
    lines.push(
      [
        `Star A-${i + 1}`,
        r.uniform(0, 360).toFixed(5),
        r.uniform(-60, 70).toFixed(5),
        r.uniform(9, 15).toFixed(2),
        'V',
        r.uniform(0.7, 2.4).toFixed(3),
        'BPRP',
        '',
        age.toFixed(0),
        (age * 0.2).toFixed(0),
        '',
        'generated',
      ].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  await bringUpBenchDatabase(database);

  // The bench's own app: only its context (database, queue stub) to create and remove the rows.
  const created = createApp({
    config: { PGDATABASE: database, LOG_LEVEL: 'silent', NODE_ENV: 'test', SMTP_PORT: 1, PUBLIC_URL: 'http://127.0.0.1' },
    // Plans are computed in-process below; nothing is queued.
    ctx: { planQueue: { enqueue: async () => undefined, close: async () => undefined } },
  });
  const { ctx } = created;
  const db = ctx.db;
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const instanceId = `api-bench-${randomUUID()}`;
  const server = await startMeasuredServer(database, port, instanceId);

  const tag = `APIB${Date.now().toString(36).toUpperCase()}`;
  const made = emptyBenchRows();
  try {
    const { viewer, email, proposalId } = await createBenchNetwork(ctx, made, {
      tag,
      passwordHash: await hashPassword(PASSWORD),
      sites: ['N', 'S'],
      siteOfNode: [0, 0, 1],
    });
    const proposal = { id: proposalId };
    const csv = Buffer.from(generateCsv(TARGETS));
    await uploadTargets(ctx, viewer, proposal.id, { buffer: csv, originalname: 'bench.csv' } as Express.Multer.File, () => 'replace');
    const plans = await computeAndStoreProposalPlans(db, proposal.id);
    const cookie = await signIn(base, email, PASSWORD);

    console.log(
      `${TARGETS} targets on 3 nodes (${plans?.plans} plans, ${plans?.errors} errors); ${RATE} req/s for ${SECONDS} s per endpoint, autocannon over loopback`,
    );
    await load(base, 'GET /api/proposals', '/api/proposals', cookie, server.pid!);
    await load(base, 'GET …/plans?pageSize=200 (all 180)', `/api/proposals/${proposal.id}/plans?pageSize=200`, cookie, server.pid!);
    await load(base, 'GET …/plans (first page)', `/api/proposals/${proposal.id}/plans`, cookie, server.pid!);
    await load(base, 'GET …/plans/status', `/api/proposals/${proposal.id}/plans/status`, cookie, server.pid!);
    console.log('target: p95 ≤ 50 ms with 0 errors for GET /api/proposals and the plans list');
  } finally {
    await stopChild(server);
    await removeBenchRows(db, made);
    await created.close();
  }
}
