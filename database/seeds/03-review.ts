import { addDays, formatISO, startOfDay } from 'date-fns';
import type { Knex } from 'knex';
import { seededRandom } from '../../shared/src/science/seeded-random';
import type { TargetValues } from '../../shared/src/proposals/target-schemas';
import { findAccountByEmail, insertAccount } from '../../server/src/features/accounts/account-repository';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plans/plan-service';
import { insertPiMember } from '../../server/src/features/proposals/team/member-repository';
import { insertTargets } from '../../server/src/features/proposals/targets/target-repository';
import { DEMO_PASSWORD } from '../demo-accounts';

/**
 * Demo review: two cycles whose calls have closed, beside the open cycle of 01-demo, so that
 * every review screen shows something on first sign-in:
 * - "<year>-R1", at the panel stage (its review deadline has passed): panel "Lower Meadow"
 *   chaired by the demo chair, with the demo reviewer and three more reviewers; eight
 *   proposals, three reviewers each, every grade in and submitted; the standing not yet locked;
 * - "<year>-R2", in review (deadline in two weeks, anonymous): panel "Upper Meadow" chaired by
 *   another reviewer, with the demo reviewer and the demo chair; eight proposals, three
 *   reviewers each, some grades saved; the demo reviewer has graded one of five;
 * - "<year>-R0", an earlier round whose review ended weeks ago and whose campaign began twenty
 *   nights ago: panel "Willow Ford" of five other reviewers, eight proposals, every grade in
 *   (04-awards locks its standing and decides its awards).
 * Proposals are small invented target lists by invented proposers (plans computed in-process).
 * Every name is invented. Runs after 02-proposals (whose truncation, with 01-demo's, clears
 * what this seed wrote before).
 */

const REVIEWERS = [
  { email: 'oona.brackenridge@halcyon.example', displayName: 'Oona Brackenridge', affiliation: 'Sedgewick Rise Observatory' },
  { email: 'caspar.wendlow@halcyon.example', displayName: 'Caspar Wendlow', affiliation: 'Fennmoor Institute of Optics' },
  { email: 'ilka.thornquist@halcyon.example', displayName: 'Ilka Thornquist', affiliation: 'Graywater College' },
  { email: 'bram.ellery@halcyon.example', displayName: 'Bram Ellery', affiliation: 'Cobble Point Station' },
  { email: 'yusra.pellingham@halcyon.example', displayName: 'Yusra Pellingham', affiliation: 'Marlow Heath University' },
];

const PROPOSERS = [
  { email: 'dorian.achterberg@halcyon.example', displayName: 'Dorian Achterberg', affiliation: 'Saltmarsh Astrophysics Group' },
  { email: 'nell.okonkwo-reyes@halcyon.example', displayName: 'Nell Okonkwo-Reyes', affiliation: 'Tern Bay Observatory' },
  { email: 'hugo.varnell@halcyon.example', displayName: 'Hugo Varnell', affiliation: 'Brindle Hill University' },
  { email: 'sanna.whitlock@halcyon.example', displayName: 'Sanna Whitlock', affiliation: 'Larkspur Space Institute' },
];

const CATEGORIES = ['Open clusters and associations', 'Field stars and planet hosts', 'Methods and calibration'];

/** Sixteen invented proposal subjects: title, abstract, category index. */
const SUBJECTS: [string, string, number][] = [
  ['Spin-down of the Heron moving group', 'Rotation periods of cool members of an invented young moving group at 300 Myr.', 0],
  [
    'Rotation across the Kraft break in the Thimble cluster',
    'F and G members of an invented 1 Gyr cluster, where magnetic braking sets in.',
    0,
  ],
  ['Slow rotators among nearby K dwarfs', 'Field K dwarfs with isochrone ages of 2–6 Gyr: do their periods agree with their ages?', 1],
  ['Periods of planet hosts with long-period companions', 'Rotation of hosts of long-period giant planets, for gyrochronological ages.', 1],
  ['Calibrating spot amplitudes with two nodes', 'The same stars from two sites of different precision, to test the amplitude model.', 2],
  ['Stalled spin-down in the Quill cluster', 'K dwarfs of an invented 1.4 Gyr cluster, where spin-down may stall.', 0],
  ['Rotation of M dwarfs in wide binaries', 'Early M dwarf companions of F and G stars with known ages.', 1],
  ['Season-to-season period stability', 'A second season of stars with known periods: how stable are the measured periods?', 2],
  ['Young suns in the Larch association', 'Solar analogues of an invented 150 Myr association.', 0],
  ['Gyrochronology of thick-disc candidates', 'Old field dwarfs with kinematic ages: the slow end of the relation.', 1],
  ['Cadence tests on fast rotators', 'Sub-day periods: how many visits a night recover them from one site?', 2],
  ['Rotation in the Brambling cluster core', 'The core of an invented 800 Myr cluster, late F to mid K.', 0],
  ['Ages of hosts of transiting planets in the south', 'Southern transiting-planet hosts without rotation periods.', 1],
  ['Spot evolution in active K dwarfs', 'How quickly do spot patterns of active K dwarfs change between rotations?', 2],
  ['Periods across the fully convective boundary', 'Mid M dwarfs near the fully convective boundary, with ages from companions.', 1],
  ['A rotation census of the Sorrel group', 'Every cool member of an invented 500 Myr group brighter than V = 14.', 0],
  ['Rotation of the Tansy cluster’s K dwarfs', 'K dwarfs of an invented 600 Myr cluster, for the slope of the relation.', 0],
  ['Old suns near the galactic plane', 'Solar-type field stars with asteroseismic-like ages from an invented catalogue.', 1],
  ['Two-site cadence for half-day periods', 'Does a second site break the one-day alias for periods near half a day?', 2],
  ['The Gorse association at 40 Myr', 'Pre-main-sequence rotators of an invented young association.', 0],
  ['Rotation of wide companions to white dwarfs', 'Cool companions whose ages come from their white dwarfs.', 1],
  ['Spot lifetimes from a long season', 'One season of dense sampling to measure how long spot groups live.', 2],
  ['Late K dwarfs of the Yarrow cluster', 'Late K members of an invented 2.5 Gyr cluster, where the relation is least tested.', 0],
  ['Periods of nearby high-velocity dwarfs', 'Old thick-disc-like dwarfs: do they spin as slowly as their kinematics say?', 1],
];

/** A small invented target list: cool dwarfs around one position, one age (a group) or several (field). */
function targetsFor(index: number, category: number): TargetValues[] {
  const r = seededRandom(9000 + index);
  const count = 4 + (index % 3);
  const raCentre = (index * 47 + 20) % 360;
  const decCentre = index % 2 ? -15 + index : 25 - index;
  const groupAge = 300 + 150 * (index % 8);
  return Array.from({ length: count }, (_, i) => {
    const field = category === 1;
    const ageMyr = field ? Math.round(r.uniform(1500, 6000)) : groupAge;
    return {
      name: `Star ${String.fromCharCode(65 + (index % 26))}${index + 1}-${i + 1}`,
      raDeg: Number(((raCentre + (field ? r.uniform(-40, 40) : r.uniform(-1, 1)) + 360) % 360).toFixed(4)),
      decDeg: Number(Math.max(-60, Math.min(60, decCentre + (field ? r.uniform(-20, 20) : r.uniform(-1, 1)))).toFixed(4)),
      magnitude: Number(r.uniform(9.5, 13.5).toFixed(2)),
      magnitudeBand: 'V',
      colour: Number(r.uniform(0.8, 2.2).toFixed(3)),
      colourSystem: 'BPRP',
      reddeningEbv: null,
      ageMyr,
      ageUncertaintyMyr: Math.round(ageMyr * 0.15),
      periodPrecisionDays: null,
      periodDays: null,
      periodUncertaintyDays: null,
      notes: '',
    } satisfies TargetValues;
  });
}

/** Loads the demo review (see the file comment). */
export async function seed(db: Knex): Promise<void> {
  await db.transaction((trx) => seedReview(trx));
}

async function accountFor(knex: Knex, person: { email: string; displayName: string; affiliation: string }, role: 'reviewer' | 'proposer') {
  const existing = await findAccountByEmail(knex, person.email);
  if (existing) return existing.id;
  return insertAccount(knex, { ...person, passwordHash: await hashPassword(DEMO_PASSWORD), roles: [role] });
}

async function seedReview(knex: Knex): Promise<void> {
  const open = await knex('cycles').orderBy('call_opens_at', 'desc').first();
  if (!open) throw new Error('03-review needs the open cycle of 01-demo');
  const manager = (await findAccountByEmail(knex, 'manager@halcyon.example'))!;
  const demoReviewer = (await findAccountByEmail(knex, 'reviewer@halcyon.example'))!;
  const demoChair = (await findAccountByEmail(knex, 'chair@halcyon.example'))!;
  const reviewerIds: number[] = [];
  for (const r of REVIEWERS) reviewerIds.push(await accountFor(knex, r, 'reviewer'));
  await knex('accounts')
    .whereIn('id', [demoReviewer.id, demoChair.id, ...reviewerIds])
    .update({ expertise: knex.raw('?::text[]', [[CATEGORIES[0], CATEGORIES[2]]]) });
  const proposerIds: { id: number; email: string }[] = [];
  for (const p of PROPOSERS) proposerIds.push({ id: await accountFor(knex, p, 'proposer'), email: p.email });

  const nodes: { id: number; code: string }[] = await knex('nodes').select('id', 'code').orderBy('id');
  const today = startOfDay(new Date());
  const year = today.getUTCFullYear();
  const day = (n: number) => addDays(today, n);
  const date = (n: number) => formatISO(day(n), { representation: 'date' });

  const makeCycle = async (spec: {
    code: string;
    title: string;
    opens: number;
    closes: number;
    deadline: number;
    start: number;
    anonymous: boolean;
  }) => {
    const [cycle] = await knex('cycles')
      .insert({
        code: spec.code,
        title: spec.title,
        call_opens_at: day(spec.opens),
        call_closes_at: day(spec.closes),
        campaign_start: date(spec.start),
        campaign_end: date(spec.start + 179),
        anonymous_review: spec.anonymous,
        categories: CATEGORIES,
        created_by: manager.id,
        review_mode: 'panel',
        reviewers_per_proposal: 3,
        review_deadline: day(spec.deadline),
      })
      .returning('id');
    const hours: Record<string, number> = { 'KRG-50': 540, 'VHM-40': 420, 'PSR-100': 500 };
    await knex('cycle_nodes').insert(nodes.map((n) => ({ cycle_id: cycle.id, node_id: n.id, node_hours_available: hours[n.code] ?? 400 })));
    return cycle.id as number;
  };

  const r1 = await makeCycle({
    code: `${year}-R1`,
    title: 'Pilot rotation round 1',
    opens: -90,
    closes: -40,
    deadline: -5,
    start: 20,
    anonymous: false,
  });
  const r2 = await makeCycle({
    code: `${year}-R2`,
    title: 'Pilot rotation round 2',
    opens: -60,
    closes: -10,
    deadline: 14,
    start: 45,
    anonymous: true,
  });

  const r0 = await makeCycle({
    code: `${year}-R0`,
    title: 'Pilot rotation round 0',
    opens: -150,
    closes: -100,
    deadline: -60,
    start: -20,
    anonymous: false,
  });

  const makePanel = async (cycleId: number, name: string, chairId: number, memberIds: number[]) => {
    const [panel] = await knex('panels')
      .insert({ cycle_id: cycleId, name, chair_account_id: chairId, spread_threshold: 3 })
      .returning('id');
    await knex('panel_members').insert(memberIds.map((account_id) => ({ panel_id: panel.id, account_id })));
    return panel.id as number;
  };
  // Panel A: the demo chair chairs; the demo reviewer and three more. Panel B: another reviewer chairs.
  const panelAMembers = [demoChair.id, demoReviewer.id, reviewerIds[0], reviewerIds[1], reviewerIds[2]];
  const panelBMembers = [reviewerIds[3], demoReviewer.id, demoChair.id, reviewerIds[4], reviewerIds[1]];
  const panelA = await makePanel(r1, 'Lower Meadow', demoChair.id, panelAMembers);
  const panelB = await makePanel(r2, 'Upper Meadow', reviewerIds[3], panelBMembers);
  // Panel C (round 0): five reviewers other than the demo reviewer and chair, so that their own pages stay as above.
  const panelCMembers = [reviewerIds[2], reviewerIds[0], reviewerIds[1], reviewerIds[3], reviewerIds[4]];
  const panelC = await makePanel(r0, 'Willow Ford', reviewerIds[2], panelCMembers);

  const grades = seededRandom(4242);
  // A reviewer's habit: some grade high, some low, which the normalised grades take out.
  const bias = new Map<number, number>(
    [...new Set([...panelAMembers, ...panelBMembers])].map((id, i) => [id, [-1.2, 0.4, 0.9, -0.4, 0.2, 1.1, -0.7][i % 7]]),
  );

  const seedCycle = async (
    cycleId: number,
    panelId: number,
    members: number[],
    subjects: [string, string, number][],
    offset: number,
    allGraded: boolean,
  ) => {
    for (let i = 0; i < subjects.length; i++) {
      const [title, abstract, category] = subjects[i];
      const pi = proposerIds[(i + offset) % proposerIds.length];
      const [{ id }] = await knex('proposals')
        .insert({ cycle_id: cycleId, pi_account_id: pi.id, title, abstract, category: CATEGORIES[category] })
        .returning('id');
      await insertPiMember(knex, id, pi);
      const requested = i % 3 === 0 ? ['KRG-50', 'VHM-40'] : i % 3 === 1 ? ['PSR-100'] : ['KRG-50'];
      await knex('proposal_nodes').insert(nodes.filter((n) => requested.includes(n.code)).map((n) => ({ proposal_id: id, node_id: n.id })));
      await insertTargets(knex, id, targetsFor(i + offset, category), 0);
      await computeAndStoreProposalPlans(knex, id);
      await knex('proposals')
        .where({ id })
        .update({ state: 'in_review', submitted_at: day(-12 - i), panel_id: panelId });

      // Three reviewers in turn, so that loads stay within one of each other.
      const quality = grades.uniform(4, 9);
      for (let j = 0; j < 3; j++) {
        const reviewer = members[(i * 3 + j) % members.length];
        // One proposal splits the panel: a spread the chair's threshold flags.
        const split = i === 2 ? (j === 0 ? -3.2 : j === 1 ? 1.8 : 0) : 0;
        const graded = allGraded || (reviewer !== demoReviewer.id ? (i + j) % 2 === 0 : i === 0);
        const grade = Math.round(Math.max(0, Math.min(10, quality + bias.get(reviewer)! + split + grades.uniform(-0.6, 0.6))) * 10) / 10;
        await knex('review_assignments').insert({
          proposal_id: id,
          reviewer_account_id: reviewer,
          source: 'automatic',
          assigned_by: manager.id,
          assigned_at: day(-9),
          notified_at: day(-9),
          grade: graded ? grade : null,
          strengths: graded ? 'A clear case; the plans support the requested node-hours.' : '',
          weaknesses: graded ? (grade < 6 ? 'The faintest targets may not reach the stated completeness.' : 'Few weaknesses.') : '',
          saved_at: graded ? day(-3) : null,
          submitted_at: allGraded ? day(-6) : null,
        });
      }
    }
  };
  await seedCycle(r1, panelA, panelAMembers, SUBJECTS.slice(0, 8), 0, true);
  await seedCycle(r2, panelB, panelBMembers, SUBJECTS.slice(8, 16), 8, false);
  await seedCycle(r0, panelC, panelCMembers, SUBJECTS.slice(16, 24), 16, true);
}
