/**
 * The age of a cluster program (targets sharing one age) from its members' implied ages:
 * the inverse-variance weighted mean of ln t (ages are log-normal-ish: the relations' ranges
 * are symmetric in ln t), its uncertainty 1/sqrt(Σw) inflated by sqrt(χ²_red) when the
 * members scatter more than their uncertainties allow (Bevington & Robinson (2003), Data
 * Reduction and Error Analysis, §4.1 weighted mean; the inflation by the Birge ratio:
 * Birge (1932), Phys. Rev. 40, 207 — both from memory). As in the gyrochronological ages of
 * clusters, only members with a measured period count (e.g. Barnes (2007), ApJ 669, 1167, who
 * ages clusters from their I-sequence members; from memory).
 */
import type { ClusterAgeFit, ImpliedAge, RotationVerdict } from '../../photometry/photometry';
import { countOf, fmt } from '../explained';

export const CLUSTER_AGE_METHOD =
  "Weighted mean of the logarithm of the members' ages, each weighted by 1/σ² with σ half the width of its 1σ range in ln t; uncertainty 1/sqrt(Σ weights), enlarged by sqrt(reduced χ²) when the members scatter more than their uncertainties allow. Only members whose period is measured (not tentative) and whose relation gives an age count. Sources: Bevington & Robinson (2003), Data Reduction and Error Analysis, §4.1 (weighted mean); Birge (1932), Phys. Rev. 40, 207 (scaling by the reduced χ²).";

export interface ClusterMember {
  targetName: string;
  verdict: RotationVerdict;
  age: ImpliedAge | null;
}

/** Members needed for a fit. */
export const CLUSTER_MIN_MEMBERS = 2;

/** The fitted age, or null with fewer than {@link CLUSTER_MIN_MEMBERS} usable members. */
export function fitClusterAge(members: ClusterMember[]): ClusterAgeFit | null {
  const excluded: { targetName: string; reason: string }[] = [];
  const usable: { name: string; lnT: number; sigma: number; age: ImpliedAge }[] = [];
  // The relation of the members: the most common among those with an age (one relation per program in practice).
  const counts = new Map<string, number>();
  for (const m of members)
    if (m.age && m.verdict === 'measured' && m.age.ageMyr !== null) counts.set(m.age.relation, (counts.get(m.age.relation) ?? 0) + 1);
  let relation: string | null = null;
  for (const [r, c] of counts) if (relation === null || c > (counts.get(relation) ?? 0)) relation = r;

  for (const m of members) {
    if (m.verdict !== 'measured') {
      excluded.push({
        targetName: m.targetName,
        reason: m.verdict === 'tentative' ? 'its period is only tentative' : 'no period was detected',
      });
      continue;
    }
    const a = m.age;
    if (!a || a.ageMyr === null || a.lowMyr === null || a.highMyr === null) {
      const blocking = a?.flags.find((f) => f.severity === 'blocking');
      excluded.push({
        targetName: m.targetName,
        reason: blocking ? blocking.message : 'its relation gives no age for it',
      });
      continue;
    }
    if (a.relation !== relation) {
      excluded.push({ targetName: m.targetName, reason: `its age comes from ${a.relationLabel}, not the relation of the other members` });
      continue;
    }
    const sigma = 0.5 * (Math.log(a.highMyr) - Math.log(a.lowMyr));
    if (!(sigma > 0) || !(a.ageMyr > 0)) {
      excluded.push({ targetName: m.targetName, reason: 'its age has no uncertainty range' });
      continue;
    }
    usable.push({ name: m.targetName, lnT: Math.log(a.ageMyr), sigma, age: a });
  }
  if (usable.length < CLUSTER_MIN_MEMBERS) return null;
  let sw = 0;
  let swx = 0;
  for (const u of usable) {
    const w = 1 / (u.sigma * u.sigma);
    sw += w;
    swx += w * u.lnT;
  }
  const mean = swx / sw;
  let chi2 = 0;
  for (const u of usable) chi2 += ((u.lnT - mean) / u.sigma) ** 2;
  const reducedChiSquare = chi2 / (usable.length - 1);
  const sigma = Math.sqrt(1 / sw) * Math.sqrt(Math.max(1, reducedChiSquare));
  const first = usable[0].age;
  return {
    ageMyr: Math.exp(mean),
    lowMyr: Math.exp(mean - sigma),
    highMyr: Math.exp(mean + sigma),
    members: usable.length,
    excluded,
    reducedChiSquare,
    method: `${CLUSTER_AGE_METHOD} Here: ${countOf(usable.length, 'member')}, reduced χ² ${fmt(reducedChiSquare)}${reducedChiSquare > 1 ? ' (uncertainty enlarged)' : ''}.`,
    relation: first.relation,
    relationLabel: first.relationLabel,
  };
}
