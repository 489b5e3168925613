import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import PDFDocument from 'pdfkit';
import { dwarfSequenceAt } from '../../shared/src/science/colour-sequence';
import { seededRandom } from '../../shared/src/science/seeded-random';
import type { TargetValues } from '../../shared/src/proposals/target-schemas';
import { findAccountByEmail, insertAccount } from '../../server/src/features/accounts/account-repository';
import { hashLinkToken } from '../../server/src/features/auth/link-token';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plans/plan-service';
import { insertPiMember } from '../../server/src/features/proposals/team/member-repository';
import { insertTargets } from '../../server/src/features/proposals/targets/target-repository';
import { DEMO_PASSWORD } from '../demo-accounts';

/**
 * Demo proposals in the open cycle of 01-demo, with their plans computed in-process, so that
 * every screen shows real numbers:
 * - "Lantern cluster rotation survey": 60 stars of one invented open cluster (one age, one
 *   distance), by the demo proposer with a second proposer as co-I and one pending
 *   invitation, on KRG-50 and VHM-40, with a justification PDF, submitted;
 * - "Ages of nearby planet hosts": 10 invented field stars in both hemispheres, on PSR-100
 *   and KRG-50, a draft with plans;
 * - two small drafts, one by the demo proposer and one by a second invented proposer.
 * The demo reviewer is on none of them. Every name is invented (stars, cluster, people).
 * Resets its own tables; runs after 01-demo.
 */

/** The invented cluster: centre, age, distance modulus, reddening. Not the position of any real cluster. */
const LANTERN = { raDeg: 163.2, decDeg: 31.6, ageMyr: 650, ageErrMyr: 60, distanceModulus: 5.0, ebv: 0.02 };
const SECOND_PROPOSER = {
  email: 'rhea.tallowmere@halcyon.example',
  displayName: 'Rhea Tallowmere',
  affiliation: 'Tallowmere Rooftop Observatory',
};

/** Cluster members: colours spread from late F to early M, V from the dwarf sequence's Mv at one distance. */
function lanternMembers(count = 60): TargetValues[] {
  const r = seededRandom(650);
  return Array.from({ length: count }, (_, i) => {
    const bpRp = Number((0.7 + (1.8 * i) / (count - 1) + r.uniform(-0.02, 0.02)).toFixed(3));
    // Positions scattered within about a degree of the centre (RA offsets widened by 1/cos δ).
    const radius = Math.sqrt(r.next()) * 1.0;
    const angle = r.uniform(0, 2 * Math.PI);
    const decDeg = LANTERN.decDeg + radius * Math.sin(angle);
    const raDeg = LANTERN.raDeg + (radius * Math.cos(angle)) / Math.cos((LANTERN.decDeg * Math.PI) / 180);
    // V = Mv + distance modulus + A_V (R_V = 3.1), plus a little scatter (binaries, photometry).
    const vMag = dwarfSequenceAt('BPRP', bpRp).absMagV + LANTERN.distanceModulus + 3.1 * LANTERN.ebv + r.uniform(-0.05, 0.05);
    return {
      name: `Lantern ${i + 1}`,
      raDeg: Number(raDeg.toFixed(5)),
      decDeg: Number(decDeg.toFixed(5)),
      magnitude: Number(vMag.toFixed(2)),
      magnitudeBand: 'V',
      colour: bpRp,
      colourSystem: 'BPRP',
      reddeningEbv: LANTERN.ebv,
      ageMyr: LANTERN.ageMyr,
      ageUncertaintyMyr: LANTERN.ageErrMyr,
      periodPrecisionDays: i % 10 === 4 ? 0.1 : null,
      // The reddest member: a fast-rotating M dwarf whose period no relation gives at this age.
      periodDays: i === count - 1 ? 0.87 : null,
      periodUncertaintyDays: i === count - 1 ? 0.05 : null,
      notes:
        i === count - 1
          ? 'fast-rotating M dwarf; expected period from a survey light curve'
          : i % 15 === 0
            ? 'photometric binary candidate'
            : '',
    };
  });
}

/** Invented field stars with individual ages, north and south. */
const PLANET_HOSTS: TargetValues[] = [
  ['Star F-1', 12.41, 41.27, 7.9, 'V', 0.62, 'BV', 4600, 900, 'one known transiting planet'],
  ['Star F-2', 48.03, -22.61, 8.6, 'V', 0.71, 'BV', 3100, 700, ''],
  ['Star F-3', 84.12, -12.5, 9.7, 'V', 0.64, 'BV', 2400, 400, 'radial-velocity planet'],
  ['Star F-4', 131.77, 18.94, 10.2, 'G', 1.12, 'BPRP', 1900, 500, ''],
  ['Star F-5', 176.3, -38.4, 9.1, 'V', 0.88, 'BV', 5200, 1500, 'two planets, long periods'],
  ['Star F-6', 209.55, 8.2, 11.4, 'G', 1.61, 'BPRP', 3800, 1200, 'K dwarf; flares seen'],
  ['Star F-7', 247.08, -51.3, 8.3, 'V', 0.58, 'BV', 1200, 300, 'young host'],
  ['Star F-8', 284.9, 33.75, 10.8, 'G', 1.35, 'BPRP', 6100, 2000, ''],
  ['Star F-9', 312.44, -4.02, 12.1, 'G', 2.05, 'BPRP', 2700, 900, 'early M dwarf host; expected period from an earlier season'],
  ['Star F-10', 351.2, -63.7, 9.4, 'V', 0.79, 'BV', 4100, 800, ''],
].map(([name, raDeg, decDeg, magnitude, band, colour, system, ageMyr, ageErr, notes]) => ({
  name: name as string,
  raDeg: raDeg as number,
  decDeg: decDeg as number,
  // Fainter than the brightest real hosts on purpose: most stay below saturation on these nodes.
  magnitude: (magnitude as number) + 1.5,
  magnitudeBand: band as TargetValues['magnitudeBand'],
  colour: colour as number,
  colourSystem: system as TargetValues['colourSystem'],
  reddeningEbv: null,
  ageMyr: ageMyr as number,
  ageUncertaintyMyr: ageErr as number,
  periodPrecisionDays: null,
  // The early M dwarf host: an expected period of its own (from an earlier season), used instead of the relation's.
  periodDays: name === 'Star F-9' ? 41.5 : null,
  periodUncertaintyDays: name === 'Star F-9' ? 4 : null,
  notes: notes as string,
}));

const YOUNG_K_DWARFS: TargetValues[] = [0, 1, 2, 3].map((i) => ({
  name: `Star K-${i + 1}`,
  raDeg: 66.5 + i * 1.7,
  decDeg: 17.2 + i * 0.9,
  magnitude: 11.2 + i * 0.6,
  magnitudeBand: 'V',
  colour: 0.95 + i * 0.12,
  colourSystem: 'BV',
  reddeningEbv: 0.01,
  ageMyr: 120,
  ageUncertaintyMyr: 30,
  periodPrecisionDays: null,
  periodDays: null,
  periodUncertaintyDays: null,
  notes: '',
}));

const WIDE_BINARIES: TargetValues[] = [0, 1, 2, 3, 4].map((i) => ({
  name: `Pair W-${Math.floor(i / 2) + 1}${i % 2 ? 'B' : 'A'}`,
  raDeg: 201.4 + i * 0.004,
  decDeg: -18.6 + i * 0.003,
  magnitude: 10.4 + i * 0.8,
  magnitudeBand: 'G',
  colour: 0.9 + i * 0.3,
  colourSystem: 'BPRP',
  reddeningEbv: null,
  ageMyr: 2200,
  ageUncertaintyMyr: 600,
  periodPrecisionDays: i === 0 ? 0.5 : null,
  periodDays: null,
  periodUncertaintyDays: null,
  notes: 'common proper-motion pair',
}));

/** A short justification as a PDF, made with pdfkit (standard fonts: no files needed). */
function justificationPdf(title: string): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', margin: 56, info: { Title: `${title}: scientific justification` } });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  doc.font('Helvetica-Bold').fontSize(16).text(title);
  doc.moveDown().font('Helvetica').fontSize(11);
  for (const p of [
    'Scientific case. The Lantern cluster is a rich open cluster of 650 Myr at about 100 pc. Its cool dwarfs have converged onto the slow rotation sequence, which makes it a calibrator of the spin-down relation between the ages of the youngest and the oldest well-studied clusters.',
    'Aims. We will measure the rotation periods of 60 members from late F to early M, from starspot modulation, with nightly photometry over a baseline of at least three cycles of the longest expected period.',
    'Feasibility. The per-target plans (cadence, baseline, visits and node-hours) follow from the expected period and amplitude of each star and from its nightly windows at Kestrel Ridge and Vindelholm; the faintest M dwarfs need the most visits and are flagged where they cannot be done as they stand.',
    'Data. Reduced light curves and the measured periods will be returned to the consortium archive within six months of the end of the campaign.',
  ]) {
    doc.text(p, { align: 'left' });
    doc.moveDown(0.6);
  }
  doc.end();
  return done;
}

/** Loads the demo proposals (see the file comment). */
export async function seed(db: Knex): Promise<void> {
  // One transaction: the demo data is there completely or not at all.
  await db.transaction((trx) => seedProposals(trx));
}

async function seedProposals(knex: Knex): Promise<void> {
  await knex.raw(
    'TRUNCATE plan_runs, target_plans, targets, proposal_files, proposal_nodes, proposal_members, proposals RESTART IDENTITY CASCADE',
  );
  const cycle = await knex('cycles').orderBy('call_opens_at', 'desc').first();
  if (!cycle) throw new Error('02-proposals needs the open cycle of 01-demo');
  const nodeId: Record<string, number> = Object.fromEntries(
    (await knex('nodes').select('id', 'code')).map((n: { id: number; code: string }) => [n.code, n.id]),
  );
  const rheaId =
    (await findAccountByEmail(knex, SECOND_PROPOSER.email))?.id ??
    (await insertAccount(knex, { ...SECOND_PROPOSER, passwordHash: await hashPassword(DEMO_PASSWORD), roles: ['proposer'] }));
  const maraId = (await findAccountByEmail(knex, 'proposer@halcyon.example'))!.id;

  const createProposal = async (input: {
    pi: { id: number; email: string };
    title: string;
    abstract: string;
    category: string;
    nodes: string[];
    targets: TargetValues[];
    coInvestigators?: { id: number; email: string }[];
    /** Default 0.9 (the column's default). */
    completeness?: number;
  }): Promise<number> => {
    const [{ id }] = await knex('proposals')
      .insert({
        cycle_id: cycle.id,
        pi_account_id: input.pi.id,
        title: input.title,
        abstract: input.abstract,
        category: input.category,
        completeness: input.completeness,
      })
      .returning('id');
    await insertPiMember(knex, id, input.pi);
    for (const c of input.coInvestigators ?? []) {
      await knex('proposal_members').insert({
        proposal_id: id,
        account_id: c.id,
        email: c.email,
        role: 'coi',
        invited_by: input.pi.id,
        accepted_at: knex.fn.now(),
      });
    }
    await knex('proposal_nodes').insert(input.nodes.map((code) => ({ proposal_id: id, node_id: nodeId[code] })));
    await insertTargets(knex, id, input.targets, 0);
    await computeAndStoreProposalPlans(knex, id);
    return id;
  };

  const mara = { id: maraId, email: 'proposer@halcyon.example' };
  const rhea = { id: rheaId, email: SECOND_PROPOSER.email };

  const lanternTitle = 'Lantern cluster rotation survey';
  const lanternId = await createProposal({
    pi: mara,
    title: lanternTitle,
    abstract:
      'We propose to measure the rotation periods of 60 cool dwarfs in the Lantern cluster, an open cluster of 650 ± 60 Myr, from starspot modulation. ' +
      'Members span late F to early M (BP−RP 0.7–2.5), so that the slow rotation sequence is traced across the whole range where gyrochronology is calibrated. ' +
      'Nightly photometry from Kestrel Ridge and Vindelholm over the campaign gives a baseline of at least three cycles of the longest expected period.',
    category: 'Open clusters and associations',
    nodes: ['KRG-50', 'VHM-40'],
    targets: lanternMembers(),
    coInvestigators: [rhea],
  });
  await knex('proposal_members').insert({
    proposal_id: lanternId,
    email: 'ansel.prewitt@halcyon.example',
    role: 'coi',
    invite_token_hash: hashLinkToken(`demo-invitation-${lanternId}`),
    invited_by: maraId,
  });
  const pdf = await justificationPdf(lanternTitle);
  await knex('proposal_files').insert({
    proposal_id: lanternId,
    kind: 'justification',
    content: pdf,
    filename: 'lantern-justification.pdf',
    content_type: 'application/pdf',
    size_bytes: pdf.length,
    sha256: createHash('sha256').update(pdf).digest('hex'),
    uploaded_by: maraId,
  });
  await knex('proposals').where({ id: lanternId }).update({ state: 'submitted', submitted_at: knex.fn.now() });

  await createProposal({
    pi: mara,
    title: 'Ages of nearby planet hosts',
    abstract:
      'Ten nearby stars with known planets have ages from isochrones alone, uncertain by a factor of two for the cooler ones. ' +
      'Rotation periods from a season of photometry give gyrochronological ages that test and sharpen those estimates, north and south.',
    category: 'Field stars and planet hosts',
    nodes: ['PSR-100', 'KRG-50'],
    targets: PLANET_HOSTS,
  });

  await createProposal({
    pi: mara,
    title: 'Spot lifetimes in young K dwarfs',
    abstract: 'A pilot: how long do the spot patterns of 120 Myr K dwarfs stay coherent?',
    category: 'Methods and calibration',
    nodes: ['KRG-50'],
    targets: YOUNG_K_DWARFS,
    // A pilot: fewer visits, at a lower chance of recovering each period.
    completeness: 0.8,
  });

  await createProposal({
    pi: rhea,
    title: 'Rotation of wide binary companions',
    abstract: 'Both members of common proper-motion pairs share an age: do their periods agree with one spin-down relation?',
    category: 'Field stars and planet hosts',
    nodes: ['PSR-100'],
    targets: WIDE_BINARIES,
  });
}
