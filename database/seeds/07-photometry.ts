import { parse } from 'csv-parse/sync';
import type { Knex } from 'knex';
import pino from 'pino';
import { startOfDay } from 'date-fns';
import { LightCurveReader } from '../../shared/src/photometry/light-curve-reader';
import { DEFAULT_DETREND } from '../../shared/src/photometry/photometry';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { findAccountByEmail } from '../../server/src/features/accounts/account-repository';
import {
  measureContextFor,
  planBasesOf,
  runPhotometryJob,
  TARGET_COLUMNS,
  type TargetRow,
} from '../../server/src/features/photometry/photometry-analysis';
import { insertRun, insertUpload, upsertLightCurve } from '../../server/src/features/photometry/photometry-repository';

/**
 * Demo returned photometry: the cluster program of the "<year>-R0" cycle (its targets share one
 * age; 05-night-plans released it) gets the demo proposer (proposer@halcyon.example) as an
 * accepted co-investigator, and light curves for all but its slowest rotator, over the campaign's
 * nights so far: four visits a night of ten 2-minute exposures on its awarded nodes, a third of
 * the nights lost to weather, white noise of 3 mmag. Each star rotates 2–12 % faster than its plan
 * expected, with a semi-amplitude of 4–7 mmag, except one whose spots have faded (nothing to
 * detect). The files are read by the app's own reader and analysed by the worker's own job,
 * run here in-process. Generated with fixed seeds; every name is invented.
 *
 * Idempotent: 01-demo's TRUNCATE … CASCADE empties the photometry tables.
 */
export async function seed(db: Knex): Promise<void> {
  const year = startOfDay(new Date()).getUTCFullYear();
  const cycle = (await db('cycles').where('code', `${year}-R0`).first('id', 'campaign_start')) as
    { id: number; campaign_start: string } | undefined;
  if (!cycle) throw new Error(`07-photometry needs the cycle ${year}-R0 of 03-review`);
  const programs = (await db('programs as g')
    .join('proposals as p', 'p.id', 'g.proposal_id')
    .where('g.cycle_id', cycle.id)
    .orderBy('p.id')
    .select('p.id', 'p.title')) as { id: number; title: string }[];
  let program: { id: number; targets: TargetRow[] } | null = null;
  for (const p of programs) {
    const targets = (await db('targets').where('proposal_id', p.id).orderBy('position').select(TARGET_COLUMNS)) as TargetRow[];
    if (targets.length >= 3 && targets.every((t) => t.age_myr === targets[0].age_myr)) {
      program = { id: p.id, targets };
      break;
    }
  }
  if (!program) throw new Error('07-photometry needs a released program whose targets share one age');
  const proposer = (await findAccountByEmail(db, 'proposer@halcyon.example'))!;
  const nodeCodes = (
    await db('award_nodes as an')
      .join('nodes as n', 'n.id', 'an.node_id')
      .where('an.proposal_id', program.id)
      .orderBy('n.code')
      .select('n.code')
  ).map((r) => r.code as string);
  const coords = await db('targets').where('proposal_id', program.id).select('id', 'name', 'ra_deg', 'dec_deg');
  const plans = await planBasesOf(
    db,
    program.id,
    program.targets.map((t) => t.id),
  );

  // Nights from the campaign's first to last night, as MJD of local evening at the nodes (UTC 20:00 + k·1h).
  const firstMjd = Date.parse(`${cycle.campaign_start}T20:00:00Z`) / 86400_000 + 40587;
  const nights = Math.max(1, Math.floor((Date.now() - Date.parse(`${cycle.campaign_start}T00:00:00Z`)) / 86400_000));
  const header = 'target,mjd,mag,error,node';
  const lines: string[] = [header];
  // By the period each plan expects: the slowest rotator has no light curve yet (it needs the
  // longest baseline), the next slowest has faded spots, the others are spotted.
  const expectedOf = (t: TargetRow) => measureContextFor(t, plans.get(t.id)).expected?.periodDays ?? 8;
  const bySpeed = [...program.targets].sort((a, b) => expectedOf(a) - expectedOf(b));
  const withData = bySpeed.slice(0, bySpeed.length - 1);
  const faded = withData.length >= 3 ? withData[withData.length - 1] : null;
  withData.forEach((t, k) => {
    const rnd = seededRandom(7100 + k);
    // The stars rotate a little faster than the relation predicts (2–12 %).
    const period = expectedOf(t) * (0.88 + 0.1 * rnd.next());
    const amplitude = t === faded ? 0 : 0.004 + 0.003 * rnd.next();
    const phase = rnd.next();
    for (let night = 0; night < nights; night++) {
      // Weather takes a third of the nights (the first and the last were clear).
      if (rnd.next() < 1 / 3 && night > 0 && night < nights - 1) continue;
      const node = nodeCodes.length ? nodeCodes[night % nodeCodes.length] : '';
      for (let visit = 0; visit < 4; visit++) {
        for (let e = 0; e < 10; e++) {
          const mjd = firstMjd + night + visit * (1.6 / 24) + (e * 2) / 1440;
          const mag = 11.5 + 0.1 * k + amplitude * Math.sin(2 * Math.PI * (mjd / period + phase)) + rnd.normal(0, 0.003);
          lines.push(`${t.name},${mjd.toFixed(6)},${mag.toFixed(5)},0.0030,${node}`);
        }
      }
    }
  });

  const reader = new LightCurveReader({
    fileName: 'season-so-far.csv',
    targets: coords.map((c) => ({ id: c.id, name: c.name, raDeg: c.ra_deg, decDeg: c.dec_deg })),
    nodeCodes,
  });
  const records = parse(lines.join('\n'), { skip_empty_lines: true }) as string[][];
  reader.header(records[0]);
  for (let i = 1; i < records.length; i++) reader.row(records[i], i);
  const read = reader.finish();
  if (read.errorCount) throw new Error(`07-photometry: the demo file does not read: ${read.errors[0]?.message}`);

  const at = new Date();
  const runId = await db.transaction(async (trx) => {
    const member = await trx('proposal_members').where({ proposal_id: program.id, account_id: proposer.id }).first('id');
    if (!member)
      await trx('proposal_members').insert({
        proposal_id: program.id,
        account_id: proposer.id,
        email: proposer.email,
        role: 'coi',
        accepted_at: at,
      });
    const points = read.series.reduce((s, x) => s + x.bjd.length, 0);
    const uploadId = await insertUpload(trx, {
      proposalId: program.id,
      uploadedBy: proposer.id,
      files: [{ fileName: 'season-so-far.csv', rows: records.length - 1 }],
      points,
      at,
    });
    for (const series of read.series)
      await upsertLightCurve(trx, { proposalId: program.id, uploadId, series, fileNames: ['season-so-far.csv'], at });
    const run = await insertRun(trx, {
      proposalId: program.id,
      total: read.series.length,
      detrend: DEFAULT_DETREND,
      requestedBy: proposer.id,
      at,
    });
    return run.id;
  });
  await runPhotometryJob(db, { runId }, pino({ level: 'silent' }));
}
