import { countOf, countText } from './explained';
import { QUANTITY_LABELS, SOURCE_TAG_DESCRIPTIONS, SOURCE_TAG_LABELS } from './quantity-labels';

describe('quantity labels and source tags', () => {
  it('labels: plain words, the symbol in parentheses', () => {
    expect(QUANTITY_LABELS.amplitudeRperPpm).toBe('Spot amplitude (Rₚₑᵣ)');
    expect(QUANTITY_LABELS.independentFrequencies).toBe('Independent frequencies searched (W)');
    expect(QUANTITY_LABELS.detectionThresholdPower).toBe('Periodogram power needed for a detection (z₀)');
  });

  it('source tags: the kinds of provenance a scientist recognises, no maintainer notes', () => {
    expect(SOURCE_TAG_LABELS.memory).toBe('published relation');
    expect(SOURCE_TAG_LABELS.choice).toBe('assumption of this product');
    for (const text of [...Object.values(SOURCE_TAG_LABELS), ...Object.values(SOURCE_TAG_DESCRIPTIONS)]) {
      expect(text).not.toMatch(/memory|re-read|verify|Spincycle|no (single )?source|our\schoice/i);
    }
  });
});

describe('countText and countOf', () => {
  it('groups digits from 10 000 up and adds the noun, singular for one', () => {
    expect(countText(9999)).toBe('9999');
    expect(countText(12932)).toBe('12,932');
    expect(countText(1234567)).toBe('1,234,567');
    expect(countOf(1, 'night')).toBe('1 night');
    expect(countOf(181, 'night')).toBe('181 nights');
    expect(countOf(12932, 'visit')).toBe('12,932 visits');
  });
});
