import { between, displayNumber, replaceTyped, typedText, withTyped } from './range-text';

describe('range-text', () => {
  it('displayNumber: a true minus sign, no float noise, no negative zero', () => {
    expect(displayNumber(-2)).toBe('−2');
    expect(displayNumber(0.1 + 0.2)).toBe('0.3');
    expect(displayNumber(-0)).toBe('0');
    expect(displayNumber(40)).toBe('40');
  });

  it('between: the one range notation, with the unit once (degrees stuck to each number)', () => {
    expect(between(-2, 25, 'mag')).toBe('between −2 and 25 mag');
    expect(between(-90, 90, '°')).toBe('between −90° and 90°');
    expect(between(0.05, 1000)).toBe('between 0.05 and 1000');
  });

  it('typedText: echoes the text as typed, minus sign of a number made true, long texts cut', () => {
    expect(typedText('-5.3')).toBe('−5.3');
    expect(typedText('-foo')).toBe('-foo');
    expect(typedText('  4e1 ')).toBe('4e1');
    expect(typedText('')).toBe('nothing');
    expect(typedText('x'.repeat(60))).toBe(`${'x'.repeat(40)}…`);
  });

  it('withTyped / replaceTyped: the echo is replaced by the cell text, or added when missing', () => {
    const message = withTyped('Enter a magnitude between −2 and 22 mag', 40);
    expect(message).toBe('Enter a magnitude between −2 and 22 mag (you typed 40).');
    expect(replaceTyped(message, '4e1')).toBe('Enter a magnitude between −2 and 22 mag (you typed 4e1).');
    expect(replaceTyped('Enter the period as well.', '0.3')).toBe('Enter the period as well (you typed 0.3).');
  });
});
