import fc from 'fast-check';
import {
  DWARF_SEQUENCE,
  REDDENING_RATIOS,
  convertColour,
  deredden,
  dwarfSequenceAt,
  resolveColour,
  requireSequence,
} from './colour-sequence';
import { ScienceInputError } from './science-input-error';

describe('dwarfSequenceAt', () => {
  it('returns every column of a table row exactly at that row (Pecaut & Mamajek 2013, Table 5, SCIENCE.md §4)', () => {
    const g2 = dwarfSequenceAt('BV', 0.65);
    expect(g2).toMatchObject({ bpRpMag: 0.823, vKsMag: 1.564, teffK: 5770, massSolar: 1.0, absMagV: 4.8, nearestSpectralType: 'G2V' });
    expect(dwarfSequenceAt('teffK', 3060).bvMag).toBeCloseTo(1.83, 12);
  });

  it('interpolates linearly between rows, entered by any column', () => {
    // Midway between G2V (B−V 0.65, Teff 5770) and G5V (0.68, 5660) [derived].
    expect(dwarfSequenceAt('BV', 0.665).teffK).toBeCloseTo(5715, 9);
    expect(dwarfSequenceAt('massSolar', 0.99).bvMag).toBeCloseTo(0.665, 9);
  });

  it('throws a ScienceInputError naming the field outside the table', () => {
    expect(() => dwarfSequenceAt('BV', 0.3, 'colour.value')).toThrow(ScienceInputError);
    expect(() => dwarfSequenceAt('BPRP', 3.5, 'colour.value')).toThrow(/colour.value: BP−RP 3.5 is outside/);
    expect(() => dwarfSequenceAt('BV', Number.NaN, 'colour.value')).toThrow(/colour.value: must be a finite number/);
  });

  it('every column is strictly monotonic, so any column can enter the table', () => {
    for (const key of ['teffK', 'bvMag', 'bpRpMag', 'vKsMag', 'absMagV', 'massSolar'] as const) {
      const col = DWARF_SEQUENCE.map((r) => r[key]);
      const sign = Math.sign(col[1] - col[0]);
      for (let i = 1; i < col.length; i++) expect(Math.sign(col[i] - col[i - 1])).toBe(sign);
    }
  });
});

describe('convertColour', () => {
  it('round-trips B−V → BP−RP → B−V inside the table (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.44, max: 1.83, noNaN: true }), (bv) => {
        const back = convertColour(convertColour(bv, 'BV', 'BPRP'), 'BPRP', 'BV');
        expect(back).toBeCloseTo(bv, 9);
      }),
    );
  });

  it('converts the solar B−V 0.65 to BP−RP 0.823 and V−Ks 1.564 (table row G2V)', () => {
    expect(convertColour(0.65, 'BV', 'BPRP')).toBeCloseTo(0.823, 12);
    expect(convertColour(0.65, 'BV', 'VKs')).toBeCloseTo(1.564, 12);
  });
});

describe('deredden', () => {
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it("removes E(B−V) scaled by each system's ratio (Casagrande & VandenBerg 2018; Cardelli et al. 1989)", () => {
    expect(deredden({ value: 0.75, system: 'BV' }, 0.1).value).toBeCloseTo(0.65, 12);
    expect(REDDENING_RATIOS.BPRP.ratio).toBe(1.339);
    expect(deredden({ value: 1.0, system: 'BPRP' }, 0.1).value).toBeCloseTo(1 - 0.1339, 12);
    expect(REDDENING_RATIOS.VKs.ratio).toBeCloseTo(2.7466, 4);
  });

  it('rejects negative, NaN or absurd reddening with the field name', () => {
    expect(() => deredden({ value: 0.7, system: 'BV' }, -0.1)).toThrow(/reddeningEbvMag: must not be negative/);
    expect(() => deredden({ value: 0.7, system: 'BV' }, Number.NaN)).toThrow(/reddeningEbvMag/);
    expect(() => deredden({ value: 0.7, system: 'BV' }, 5)).toThrow(/reddeningEbvMag: must be at most 3/);
  });
});

describe('resolveColour', () => {
  it('places a reddened colour on the sequence after de-reddening', () => {
    const r = resolveColour({ value: 0.95, system: 'BV' }, 0.3);
    expect(r.intrinsic.value).toBeCloseTo(0.65, 12);
    expect(r.sequence?.teffK).toBeCloseTo(5770, 9);
  });

  it('returns no sequence outside the table, and requireSequence then throws naming the field', () => {
    const r = resolveColour({ value: 0.42, system: 'BV' }, 0);
    expect(r.sequence).toBeNull();
    expect(() => requireSequence(r)).toThrow(
      'colour.value: B−V 0.42 is outside the dwarf colour sequence (between 0.44 and 1.83 mag; Pecaut & Mamajek 2013)',
    );
  });

  it('requireSequence quotes the colour as typed, and what removing the reddening gave', () => {
    const r = resolveColour({ value: 0.9, system: 'BV' }, 0.5);
    expect(r.sequence).toBeNull();
    expect(() => requireSequence(r)).toThrow(
      'colour.value: B−V 0.9 (0.4 after removing the reddening E(B−V) = 0.5) is outside the dwarf colour sequence (between 0.44 and 1.83 mag; Pecaut & Mamajek 2013)',
    );
  });

  it('rejects an unknown colour system', () => {
    expect(() => resolveColour({ value: 0.5, system: 'UB' as never }, 0)).toThrow(/colour.system: must be one of/);
  });
});
