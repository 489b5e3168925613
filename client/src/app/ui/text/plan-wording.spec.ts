import type { NodeSpec, SiteSpec } from '@spincycle/shared/facility/facility-types';
import { computeTargetPlan } from '@spincycle/shared/science/target-plan';
import { plainFlag, plainReference, plainSentence, plainText, provenanceKind, provenanceOf } from './plan-wording';

const NODE: NodeSpec = {
  apertureM: 0.4,
  obstructionFraction: 0.35,
  throughput: 0.6,
  band: 'V',
  readNoiseE: 9,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.3,
  saturationE: 60000,
  pixelScaleArcsec: 1.2,
  seeingFwhmArcsec: 1.6,
  systematicFloorMmag: 1.5,
  scintillationModel: 'young1967',
  overheadSeconds: 60,
  minExposureSeconds: 2,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 30,
  sunAltitudeLimitDeg: -12,
  weatherLossFraction: 0.25,
  rateMinorPerHour: 4850,
  currency: 'eur',
};
const SITE: SiteSpec = { latitudeDeg: 28.76, longitudeDeg: -17.88, elevationM: 2326, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 21.6 };

/** Developer wording that must never reach a user. */
const DEVELOPER_WORDING =
  /from memory|our choice|Spincycle['’]s choice|no source|\[derived|\b(max|min)Exposure\b|saturationE|young1967|osborn2015|angus2019\b|barnes2007\b|noyes1984\b/;

describe('plan-wording', () => {
  it('says "saturation of the star" once, whether or not the core already says it', () => {
    expect(plainText('limited by saturation')).toBe('limited by saturation of the star');
    expect(plainText('best 1620 ppm at 32.5 s, limited by saturation of the star')).toBe(
      'best 1620 ppm at 32.5 s, limited by saturation of the star',
    );
  });

  it('plainText: provenance notes, code names and citation keys become plain words', () => {
    expect(plainText('CCD equation (Howell 2006; Merline & Howell 1995, from memory) + scintillation')).toBe(
      'CCD equation (Howell 2006; Merline & Howell 1995) + scintillation',
    );
    expect(plainText('Noyes et al. (1984), ApJ 279, 763, eq. 4 (equation number from memory)')).toBe(
      'Noyes et al. (1984), ApJ 279, 763, eq. 4',
    );
    expect(plainText('Barnes (2003), ApJ 586, 464; Curtis et al. (2020), ApJ 904, 140 (both from memory)')).toBe(
      'Barnes (2003), ApJ 586, 464; Curtis et al. (2020), ApJ 904, 140',
    );
    expect(plainText('limited by maxExposure')).toBe("limited by the node's longest exposure");
    expect(plainText('4 exposures of 16 s (capped by saturation) need the least node time')).toBe(
      '4 exposures of 16 s (capped by saturation of the star) need the least node time',
    );
    expect(plainText('scintillation (young1967)')).toBe('scintillation (Young (1967))');
    expect(plainText("rounding: Spincycle's choice, no source")).toBe('rounding: an assumption of Spincycle');
    expect(plainText('peak pixel against the node saturationE')).toBe("peak pixel against the node's saturation level");
    expect(plainText('5–95 % range of a sinusoid [derived]')).toBe('5–95 % range of a sinusoid');
  });

  it('plainSentence: a capital and a full stop, never a capitalised Greek letter', () => {
    expect(plainSentence('the star saturates')).toBe('The star saturates.');
    expect(plainSentence('σ_night² = σ²/k')).toBe('σ_night² = σ²/k.');
  });

  it('provenance: a published relation, a node parameter, an assumption, the user’s input or a calculation', () => {
    expect(provenanceKind('Angus et al. (2019), AJ 158, 173', 'paper')).toBe('published');
    expect(provenanceKind('Kasten & Young (1989), Appl. Opt. 28, 4735 (from memory)', 'memory')).toBe('published');
    expect(provenanceKind("the node's rate card", 'facility')).toBe('facility');
    expect(provenanceKind("Spincycle's choice, no source", 'choice')).toBe('assumption');
    expect(provenanceKind('common practice, no single source', 'practice')).toBe('assumption');
    expect(provenanceKind("the proposal's setting", 'choice')).toBe('input');
    expect(provenanceKind("the user's choice, within the node's exposure range", 'choice')).toBe('input');
    expect(provenanceKind('definition of node-hours', 'practice')).toBe('calculation');
    expect(provenanceOf({ source: "Spincycle's choice, no source", tag: 'choice' })).toEqual({
      kind: 'assumption',
      label: 'Spincycle assumption',
      description: expect.stringContaining('not taken from a publication'),
      reference: 'An assumption of Spincycle, not taken from a publication',
    });
    expect(plainReference('common practice, no single source', 'assumption')).toBe('Common observing practice, not a single publication');
  });

  it('a whole plan: no why line, source or notice carries developer wording', () => {
    for (const [ageMyr, colour, magnitude] of [
      [800, 1.1, 11.5],
      [4000, 1.1, 15],
      [800, 1.1, 8],
      [150, 2.0, 13],
    ] as const) {
      const plan = computeTargetPlan(
        { colour: { value: colour, system: 'BPRP' }, ageMyr, ageUncertaintyMyr: 100, magnitude: { value: magnitude, band: 'G' } },
        NODE,
        SITE,
      );
      for (const q of Object.values(plan.quantities)) {
        expect(plainText(q.why)).not.toMatch(DEVELOPER_WORDING);
        expect(provenanceOf(q).reference).not.toMatch(DEVELOPER_WORDING);
      }
      for (const flag of plan.flags) {
        const plain = plainFlag(flag);
        expect(plain.message).not.toMatch(DEVELOPER_WORDING);
        expect(plain.source ?? '').not.toMatch(DEVELOPER_WORDING);
      }
    }
  });
});
