/**
 * Proposal target list: upload of a generated 500-target CSV (parse + validate + insert) and
 * the plan job on 3 nodes (sky windows + 1500 target plans + one write transaction), timed on
 * the server side against the test database. Target: ≤ 2 s in all. Creates throw-away rows
 * (account, sites, nodes, cycle, proposal) and deletes them at the end.
 */
import pino from 'pino';
import type { AppContext } from '../../server/src/app-context';
import { loadConfig } from '../../server/src/config';
import { createDb } from '../../server/src/db/knex';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plans/plan-service';
import { decodeCsvText, readTargetCsvStream } from '../../server/src/features/proposals/targets/target-csv';
import { uploadTargets } from '../../server/src/features/proposals/targets/target-service';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { formatDecDms, formatRaHms } from '../../shared/src/proposals/sexagesimal';
import { bringUpBenchDatabase, createBenchNetwork, emptyBenchRows, removeBenchRows } from './support/bench-network';

const TARGETS = 500;
const RUNS = 3;
const ms = (t: number) => `${t.toFixed(0).padStart(5)} ms`;

function generateCsv(count: number): string {
  const r = seededRandom(500);
  const lines = ['name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,notes'];
  for (let i = 0; i < count; i++) {
    const ra = r.uniform(0, 360);
    const dec = r.uniform(-60, 70);
    const bprp = r.next() < 0.5;
    const colour = bprp ? r.uniform(0.7, 2.4) : r.uniform(0.5, 1.4);
    const age = r.uniform(300, 6000);
    // Half the positions sexagesimal (the parser's slower path), half decimal degrees.
    const [raText, decText] = i % 2 ? [formatRaHms(ra), formatDecDms(dec).replace('−', '-')] : [ra.toFixed(5), dec.toFixed(5)];
    lines.push(
      [
        `Star B-${i + 1}`,
        raText,
        decText,
        r.uniform(9, 15).toFixed(2),
        r.next() < 0.5 ? 'V' : 'G',
        colour.toFixed(3),
        bprp ? 'BPRP' : 'BV',
        '',
        age.toFixed(0),
        (age * 0.2).toFixed(0),
        r.next() < 0.3 ? '0.2' : '',
        'generated',
      ].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  await bringUpBenchDatabase(database);

  const config = loadConfig({ ...process.env, PGDATABASE: database, LOG_LEVEL: 'silent', NODE_ENV: 'test' });
  const logger = pino({ level: 'silent' });
  const db = createDb(config, logger);
  const ctx: AppContext = {
    config,
    db,
    logger,
    mailer: { send: async () => undefined, close: () => undefined },
    // The benchmark runs the plan job itself, in-process (no queue).
    planQueue: { enqueue: async () => undefined, close: async () => undefined },
    now: () => new Date(),
  };
  const tag = `BENCH${Date.now().toString(36).toUpperCase()}`;
  const created = emptyBenchRows();
  try {
    const { viewer, proposalId } = await createBenchNetwork(ctx, created, {
      tag,
      passwordHash: 'x',
      sites: ['N', 'E', 'S'],
      siteOfNode: [0, 1, 2],
    });
    const proposal = { id: proposalId };

    const csv = Buffer.from(generateCsv(TARGETS));
    console.log(
      `${TARGETS} targets (${(csv.length / 1024).toFixed(0)} kB CSV, half sexagesimal) on 3 nodes, 180-night campaign; ${RUNS} runs`,
    );
    console.log('run  parse+validate  upload (parse+validate+insert)  plan compute  plan write   total   plans');
    for (let run = 1; run <= RUNS; run++) {
      const t0 = performance.now();
      const list = await readTargetCsvStream(decodeCsvText(csv, 'bench.csv'));
      const parseMs = performance.now() - t0;
      if (list.errors.length) throw new Error(`generated CSV has problems: ${JSON.stringify(list.errors.slice(0, 3))}`);
      const t1 = performance.now();
      const uploaded = await uploadTargets(
        ctx,
        viewer,
        proposal.id,
        { buffer: csv, originalname: 'bench.csv' } as Express.Multer.File,
        () => 'replace',
      );
      const uploadMs = performance.now() - t1;
      const t2 = performance.now();
      const result = await computeAndStoreProposalPlans(db, proposal.id);
      const planMs = performance.now() - t2;
      if (!result || uploaded.added !== TARGETS) throw new Error('the benchmark proposal vanished');
      console.log(
        `${String(run).padStart(3)}  ${ms(parseMs).padStart(14)}  ${ms(uploadMs).padStart(29)}  ${ms(result.computeMs).padStart(12)}  ${ms(result.writeMs).padStart(10)}  ${ms(uploadMs + planMs)}  ${result.plans} (${result.errors} errors)`,
      );
    }
    console.log('target: upload + plan job ≤ 2000 ms');
  } finally {
    await removeBenchRows(db, created);
    await db.destroy();
  }
}
