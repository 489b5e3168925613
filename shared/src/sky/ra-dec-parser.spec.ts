import fc from 'fast-check';
import { parseDec, parseRa, parseRaDec } from './ra-dec-parser';
import { SkyInputError } from './sky-input-error';

function errorOf(fn: () => unknown): SkyInputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof SkyInputError) return e;
    throw e;
  }
  throw new Error('expected a SkyInputError');
}

describe('parseRaDec', () => {
  it.each([
    ['187.5', 187.5],
    ['187.5d', 187.5],
    ['187.5°', 187.5],
    ['12.5h', 187.5],
    ['12:30:00', 187.5],
    ['12 30 00.0', 187.5],
    ['12h30m00s', 187.5],
    ['12h 30m', 187.5],
    ['  0:00:00 ', 0],
    ['23:59:59.999', 359.9999958333],
    ['187°30′00″', 187.5],
  ])('RA %j is read as %d degrees', (text, expected) => {
    expect(parseRa(text)).toBeCloseTo(expected, 8);
  });

  it.each([
    ['-5.3416667', -5.3416667],
    ['-05:20:30', -5.341666667],
    ['−05°20′30″', -5.341666667],
    ['-05°20\'30"', -5.341666667],
    ['-05d20m30s', -5.341666667],
    ['+38 47 01.28', 38.783688889],
    ['-00:30:00', -0.5],
    ['90', 90],
    ['-90:00:00', -90],
    ['45.5°', 45.5],
  ])('Dec %j is read as %d degrees', (text, expected) => {
    expect(parseDec(text)).toBeCloseTo(expected, 8);
  });

  it('reads a pair and names the fields with a prefix in errors', () => {
    expect(parseRaDec('18:36:56.336', '+38:47:01.28')).toEqual({
      raDeg: expect.closeTo(279.234733, 6),
      decDeg: expect.closeTo(38.783689, 6),
    });
    const e = errorOf(() => parseRaDec('12:00:00', '95', 'targets[3].'));
    expect(e.field).toBe('targets[3].dec');
    expect(e.reason).toBe('declination must be between −90° and 90°, got 95');
  });

  it.each([
    ['24:00:00', 'ra', /^right ascension must be below 24 h, got 24:00:00$/],
    ['360', 'ra', /^right ascension must be below 360°, got 360$/],
    ['-10', 'ra', /^right ascension cannot be negative, got −10$/],
    ['12:61:00', 'ra', /minutes must be below 60/],
    ['12:30:60', 'ra', /seconds must be below 60/],
    ['12.5:30', 'ra', /only the last part/],
    ['abc', 'ra', /unexpected "a"/],
    ['', 'ra', /empty/],
    ['1:2:3:4', 'ra', /more than three parts/],
    ['30m', 'ra', /single value must be degrees or hours/],
  ])('RA %j is refused (field %s, %s)', (text, field, reason) => {
    const e = errorOf(() => parseRa(text));
    expect(e.field).toBe(field);
    expect(e.reason).toMatch(reason);
  });

  it.each([
    ['91', /^declination must be between −90° and 90°, got 91$/],
    ['-90:00:01', /^declination must be between −90° and 90°, got −90:00:01$/],
    ['+95:12:00', /^declination must be between −90° and 90°, got \+95:12:00$/],
    ['5h', /cannot be given in hours/],
    ['12h30m', /cannot be given in hours/],
    ['NaN', /unexpected "N"/],
    ['--5', /unexpected "-"/],
  ])('Dec %j is refused (%s)', (text, reason) => {
    const e = errorOf(() => parseDec(text));
    expect(e.field).toBe('dec');
    expect(e.reason).toMatch(reason);
  });

  it('refuses non-finite numbers and missing values', () => {
    expect(errorOf(() => parseRa(Number.NaN)).reason).toMatch(/finite/);
    expect(errorOf(() => parseDec(undefined)).reason).toMatch(/missing/);
  });

  it('round-trips any sexagesimal RA/Dec it formats itself (property, seeded)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 86_399_999 }), fc.integer({ min: -324_000_000, max: 324_000_000 }), (raMs, decMas10) => {
        const raSeconds = raMs / 1000;
        const h = Math.floor(raSeconds / 3600);
        const m = Math.floor((raSeconds - h * 3600) / 60);
        const s = raSeconds - h * 3600 - m * 60;
        const raText = `${h}:${String(m).padStart(2, '0')}:${s.toFixed(3).padStart(6, '0')}`;
        const decArcsec = Math.abs(decMas10) / 1000;
        const dd = Math.floor(decArcsec / 3600);
        const dm = Math.floor((decArcsec - dd * 3600) / 60);
        const ds = decArcsec - dd * 3600 - dm * 60;
        const decText = `${decMas10 < 0 ? '−' : '+'}${dd}°${dm}′${ds.toFixed(3)}″`;
        const parsed = parseRaDec(raText, decText);
        expect(parsed.raDeg).toBeCloseTo((raSeconds / 3600) * 15, 6);
        expect(parsed.decDeg).toBeCloseTo(decMas10 / 3_600_000, 6);
      }),
      { seed: 99, numRuns: 300 },
    );
  });
});
