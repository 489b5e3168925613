import { reasonSentence } from './reason-sentence';

describe('reasonSentence', () => {
  it('a lower-case remark becomes a sentence', () => {
    expect(reasonSentence('the star saturates at 2 s')).toBe('The star saturates at 2 s.');
    expect(reasonSentence('Already one.')).toBe('Already one.');
  });

  it('a lead-in repeated by nested layers is said once', () => {
    expect(
      reasonSentence(
        "no expected period: no expected period: the given age 14000 Myr exceeds the age of the universe, 13787 Myr. Give the star's expected period to plan it",
      ),
    ).toBe(
      "No expected period: the given age 14000 Myr exceeds the age of the universe, 13787 Myr. Give the star's expected period to plan it.",
    );
  });

  it('an empty text stays empty', () => {
    expect(reasonSentence('  ')).toBe('');
  });
});
