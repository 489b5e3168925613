import { parseDec, parseRa } from '../sky/ra-dec-parser';
import { SkyInputError } from '../sky/sky-input-error';
import { coordinateMessage, type CoordinateKind } from './coordinate-messages';

/** The message for a text the parser refuses. */
function refused(kind: CoordinateKind, text: string): string {
  try {
    if (kind === 'ra') parseRa(text);
    else parseDec(text);
  } catch (error) {
    if (error instanceof SkyInputError) return coordinateMessage(kind, error.reason, text);
    throw error;
  }
  throw new Error(`${text} was read`);
}

describe('coordinateMessage', () => {
  it('ranges in the one notation, with the text as typed', () => {
    expect(refused('dec', '95.2')).toBe('Enter a declination between −90° and 90° (you typed 95.2).');
    expect(refused('dec', '-95:00:00')).toBe('Enter a declination between −90° and 90° (you typed −95:00:00).');
    expect(refused('ra', '25h')).toBe('Enter a right ascension between 0 and 24 h or between 0° and 360° (you typed 25h).');
    expect(refused('ra', '400')).toBe('Enter a right ascension between 0 and 24 h or between 0° and 360° (you typed 400).');
  });

  it('unreadable texts name the accepted forms; sexagesimal parts say which part', () => {
    expect(refused('ra', 'abc')).toBe(
      'Write the right ascension as degrees (187.5), hours (12.5h) or sexagesimal hours (12:30:00) (you typed abc).',
    );
    expect(refused('dec', '10:75:00')).toBe('Keep the minutes of the declination below 60 (you typed 10:75:00).');
    expect(refused('dec', '5h')).toBe('Give the declination in degrees, not hours (you typed 5h).');
    expect(coordinateMessage('ra', 'is empty', '')).toBe('Enter the right ascension.');
  });
});
