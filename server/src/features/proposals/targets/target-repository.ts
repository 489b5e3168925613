import type { Knex } from 'knex';
import type { NodeBand } from '@spincycle/shared/facility/facility-types';
import type { TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import type { TargetRow, TargetValues } from '@spincycle/shared/proposals/target-schemas';

interface TargetDbRow {
  id: number;
  proposal_id: number;
  position: number;
  name: string;
  ra_deg: number;
  dec_deg: number;
  magnitude: number;
  magnitude_band: NodeBand;
  colour: number;
  colour_system: TargetColourSystem;
  reddening_ebv: number | null;
  age_myr: number;
  age_uncertainty_myr: number | null;
  period_precision_days: number | null;
  period_days: number | null;
  period_uncertainty_days: number | null;
  notes: string;
  version: number;
  updated_at: Date;
}

/** A stored target with the time of its last change (for conflict messages). */
export interface StoredTarget extends TargetRow {
  updatedAt: string;
}

function toTarget(r: TargetDbRow): StoredTarget {
  return {
    id: r.id,
    position: r.position,
    version: r.version,
    name: r.name,
    raDeg: r.ra_deg,
    decDeg: r.dec_deg,
    magnitude: r.magnitude,
    magnitudeBand: r.magnitude_band,
    colour: r.colour,
    colourSystem: r.colour_system,
    reddeningEbv: r.reddening_ebv,
    ageMyr: r.age_myr,
    ageUncertaintyMyr: r.age_uncertainty_myr,
    periodPrecisionDays: r.period_precision_days,
    periodDays: r.period_days,
    periodUncertaintyDays: r.period_uncertainty_days,
    notes: r.notes,
    updatedAt: r.updated_at.toISOString(),
  };
}

/** The API shape (without the repository-only `updatedAt`). */
export function toTargetRow({ updatedAt: _hidden, ...row }: StoredTarget): TargetRow {
  return row;
}

function columnsOf(v: TargetValues) {
  return {
    name: v.name,
    ra_deg: v.raDeg,
    dec_deg: v.decDeg,
    magnitude: v.magnitude,
    magnitude_band: v.magnitudeBand,
    colour: v.colour,
    colour_system: v.colourSystem,
    reddening_ebv: v.reddeningEbv,
    age_myr: v.ageMyr,
    age_uncertainty_myr: v.ageUncertaintyMyr,
    period_precision_days: v.periodPrecisionDays,
    period_days: v.periodDays,
    period_uncertainty_days: v.periodUncertaintyDays,
    notes: v.notes,
  };
}

/** The proposal's targets in list order. */
export async function listTargets(db: Knex, proposalId: number): Promise<StoredTarget[]> {
  const rows: TargetDbRow[] = await db('targets').where({ proposal_id: proposalId }).orderBy('position').orderBy('id');
  return rows.map(toTarget);
}

/** One target of the proposal; `forUpdate` locks its row. */
export async function findTarget(
  db: Knex,
  proposalId: number,
  targetId: number,
  options: { forUpdate?: boolean } = {},
): Promise<StoredTarget | undefined> {
  const q = db<TargetDbRow>('targets').where({ proposal_id: proposalId, id: targetId }).first();
  if (options.forUpdate) q.forUpdate();
  const row = await q;
  return row ? toTarget(row) : undefined;
}

/** Names already used in the proposal, lower-cased, with the target id. */
export async function targetNamesOf(db: Knex, proposalId: number): Promise<Map<string, number>> {
  const rows: { id: number; name: string }[] = await db('targets').where({ proposal_id: proposalId }).select('id', 'name');
  return new Map(rows.map((r) => [r.name.toLowerCase(), r.id]));
}

/** How many targets the proposal holds. */
export async function countTargets(db: Knex, proposalId: number): Promise<number> {
  const [{ n }] = await db('targets').where({ proposal_id: proposalId }).count<{ n: number }[]>({ n: '*' });
  return n;
}

/** The last position used in the list (0 when empty). */
export async function maxTargetPosition(db: Knex, proposalId: number): Promise<number> {
  const row = await db('targets').where({ proposal_id: proposalId }).max<{ max: number | null }>('position as max').first();
  return row?.max ?? 0;
}

/** Inserts rows at consecutive positions after `afterPosition` (in batches: a 2000-row list is one statement per 500). */
export async function insertTargets(db: Knex, proposalId: number, values: TargetValues[], afterPosition: number): Promise<void> {
  const rows = values.map((v, i) => ({ ...columnsOf(v), proposal_id: proposalId, position: afterPosition + i + 1 }));
  for (let i = 0; i < rows.length; i += 500) await db('targets').insert(rows.slice(i, i + 500));
}

/** Inserts one target at a position; returns its id. */
export async function insertTarget(db: Knex, proposalId: number, values: TargetValues, position: number): Promise<number> {
  const [row] = await db('targets')
    .insert({ ...columnsOf(values), proposal_id: proposalId, position })
    .returning('id');
  return row.id;
}

/** Writes the values and increments the row's version. */
export async function updateTargetRow(db: Knex, targetId: number, values: TargetValues): Promise<void> {
  await db('targets')
    .where({ id: targetId })
    .update({ ...columnsOf(values), version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/** Deletes one target (its plans go with it). */
export async function deleteTargetRow(db: Knex, targetId: number): Promise<void> {
  await db('targets').where({ id: targetId }).del();
}

/** Removes every target of the proposal (their plans go with them); returns how many. */
export async function deleteAllTargets(db: Knex, proposalId: number): Promise<number> {
  return db('targets').where({ proposal_id: proposalId }).del();
}
