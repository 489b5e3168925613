import { SkyInputError } from './sky-input-error';
import { computeSkyWindows } from './sky-windows';
import type { SkyWindowsInput } from './sky-types';

const valid: SkyWindowsInput = {
  site: { latitudeDeg: 28.76, longitudeDeg: -17.88, elevationM: 2300, timeZone: 'Atlantic/Canary' },
  limits: { altitudeLimitDeg: 30 },
  campaign: { firstNight: '2025-03-01', lastNight: '2025-03-03' },
  targets: [
    { raDeg: 10, decDeg: 20 },
    { raDeg: 20, decDeg: 30 },
    { raDeg: 30, decDeg: 40 },
    { raDeg: 40, decDeg: 50 },
  ],
};

function fieldOf(input: unknown): string {
  try {
    computeSkyWindows(input as SkyWindowsInput);
  } catch (e) {
    expect(e).toBeInstanceOf(SkyInputError);
    return (e as SkyInputError).field;
  }
  throw new Error('expected computeSkyWindows to throw');
}

const withTarget3 = (t: Record<string, unknown>) => ({ ...valid, targets: valid.targets.map((x, i) => (i === 3 ? t : x)) });

describe('computeSkyWindows input checks', () => {
  it('accepts the valid input', () => {
    expect(computeSkyWindows(valid).targets).toHaveLength(4);
  });

  it.each([
    ['RA above 360', withTarget3({ raDeg: 361, decDeg: 0 }), 'targets[3].raDeg'],
    ['RA of exactly 360', withTarget3({ raDeg: 360, decDeg: 0 }), 'targets[3].raDeg'],
    ['negative RA', withTarget3({ raDeg: -0.1, decDeg: 0 }), 'targets[3].raDeg'],
    ['Dec above 90', withTarget3({ raDeg: 10, decDeg: 90.5 }), 'targets[3].decDeg'],
    ['Dec below −90', withTarget3({ raDeg: 10, decDeg: -91 }), 'targets[3].decDeg'],
    ['NaN Dec', withTarget3({ raDeg: 10, decDeg: Number.NaN }), 'targets[3].decDeg'],
    ['NaN RA', withTarget3({ raDeg: Number.NaN, decDeg: 0 }), 'targets[3].raDeg'],
    ['RA as a string', withTarget3({ raDeg: '10', decDeg: 0 }), 'targets[3].raDeg'],
    ['infinite proper motion', withTarget3({ raDeg: 1, decDeg: 0, pmDecMasPerYr: Infinity }), 'targets[3].pmDecMasPerYr'],
    ['campaign end before start', { ...valid, campaign: { firstNight: '2025-03-05', lastNight: '2025-03-01' } }, 'campaign.lastNight'],
    ['impossible date', { ...valid, campaign: { firstNight: '2025-02-30', lastNight: '2025-03-01' } }, 'campaign.firstNight'],
    ['latitude NaN', { ...valid, site: { ...valid.site, latitudeDeg: Number.NaN } }, 'site.latitudeDeg'],
    ['longitude 200', { ...valid, site: { ...valid.site, longitudeDeg: 200 } }, 'site.longitudeDeg'],
    ['unknown time zone', { ...valid, site: { ...valid.site, timeZone: 'Mars/Olympus' } }, 'site.timeZone'],
    ['no altitude limit', { ...valid, limits: {} }, 'limits.altitudeLimitDeg'],
    ['both limits', { ...valid, limits: { altitudeLimitDeg: 30, airmassLimit: 2 } }, 'limits.airmassLimit'],
    ['airmass below 1', { ...valid, limits: { airmassLimit: 0.9 } }, 'limits.airmassLimit'],
    ['Sun limit above 0', { ...valid, limits: { altitudeLimitDeg: 30, sunAltitudeLimitDeg: 5 } }, 'limits.sunAltitudeLimitDeg'],
    ['bad refraction', { ...valid, limits: { altitudeLimitDeg: 30, refraction: 'strong' } }, 'limits.refraction'],
    ['targets not an array', { ...valid, targets: 'x' }, 'targets'],
    ['a target that is not an object', { ...valid, targets: [null] }, 'targets[0]'],
  ])('%s → SkyInputError naming %s', (_label, input, field) => {
    expect(fieldOf(input)).toBe(field);
  });

  it('says why in the message', () => {
    expect(() => computeSkyWindows(withTarget3({ raDeg: 10, decDeg: 91 }) as SkyWindowsInput)).toThrow(
      'targets[3].decDeg: must be between −90° and 90°, got 91',
    );
  });
});
