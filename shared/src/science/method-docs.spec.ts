import { readFileSync } from 'node:fs';
import path from 'node:path';
import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';
import { combinePlanWithSky } from '../planning/node-target-plan';
import { syntheticWindows } from '../sky/testing/synthetic-windows';
import { METHOD_SECTIONS, PLAN_QUANTITY_DOCS, SKY_QUANTITY_DOCS, methodsLinkFor } from './method-docs';
import { QUANTITY_LABELS } from './quantity-labels';
import { computeTargetPlan } from './target-plan';

const DOC = readFileSync(path.resolve(__dirname, '../../../docs/science.md'), 'utf8');

/** Every `<a id="…"></a>` anchor of docs/science.md, in order. */
function docAnchors(text: string): string[] {
  return Array.from(text.matchAll(/<a id="([^"]+)"><\/a>/g), (m) => m[1]);
}

const ANCHORS = docAnchors(DOC);

const plan = computeTargetPlan(
  { name: 'Star A-1', colour: { value: 0.82, system: 'BPRP' }, ageMyr: 1000, ageUncertaintyMyr: 100, magnitude: { value: 11, band: 'V' } },
  TYPICAL_NODE,
  TYPICAL_SITE,
);

describe('method docs: docs/science.md anchors', () => {
  it('docs/science.md names each quantity with the label the screens show', () => {
    const named = Array.from(DOC.matchAll(/\*\*([^*]+)\*\*\s*\(`(\w+)`\)/g), (m) => [m[2], m[1].replace(/\s+/g, ' ')] as const);
    expect(named.length).toBeGreaterThan(30);
    for (const [key, label] of named) {
      const shown = (QUANTITY_LABELS as Record<string, string>)[key];
      if (shown !== undefined) expect([key, label]).toEqual([key, shown]);
    }
  });

  it('docs/science.md: every anchor is unique and kebab-case', () => {
    expect(ANCHORS.length).toBeGreaterThan(20);
    expect(new Set(ANCHORS).size).toBe(ANCHORS.length);
    for (const a of ANCHORS) expect(a).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
  });

  it('plan quantities: every anchor they name exists in docs/science.md', () => {
    for (const [key, anchor] of Object.entries(PLAN_QUANTITY_DOCS))
      expect({ key, exists: ANCHORS.includes(anchor) }).toEqual({ key, exists: true });
  });

  it('sky quantities and direct sections: every anchor they name exists in docs/science.md', () => {
    for (const [key, anchor] of Object.entries(SKY_QUANTITY_DOCS))
      expect({ key, exists: ANCHORS.includes(anchor) }).toEqual({ key, exists: true });
    for (const anchor of METHOD_SECTIONS) expect({ anchor, exists: ANCHORS.includes(anchor) }).toEqual({ anchor, exists: true });
  });

  it('a computed plan: every quantity key it carries has a section', () => {
    const missing = Object.keys(plan.quantities).filter((key) => !(key in PLAN_QUANTITY_DOCS));
    expect(missing).toEqual([]);
  });

  it('a plan checked against its sky window: every sky count shown has a section', () => {
    const windows = syntheticWindows({ usableHours: Array.from({ length: 120 }, (_, i) => (i % 9 === 0 ? 0 : 5)), summarize: true });
    const combined = combinePlanWithSky(plan, windows, TYPICAL_NODE);
    const shown = [
      ...Object.keys(windows.summary).filter((k) => k !== 'visibility'),
      ...(['qualifyingNights', 'expectedClearNights', 'visitingNightsNeeded', 'cadenceNightsNeeded', 'stretchDays'] as const).filter(
        (k) => k in combined.sky,
      ),
      ...(['longestSeasonDays', 'seasonsInCampaign'] as const).filter((k) => k in combined.season),
      ...(['minCoverage', 'requiredBaselineDays'] as const).filter((k) => k in combined.phase),
    ];
    expect(shown.length).toBeGreaterThan(10);
    expect(shown.filter((key) => !(key in SKY_QUANTITY_DOCS))).toEqual([]);
  });

  it('every plan quantity is named in the text of its section (the doc says which number it explains)', () => {
    for (const [key, anchor] of Object.entries(PLAN_QUANTITY_DOCS)) {
      const start = DOC.indexOf(`<a id="${anchor}"></a>`);
      const next = DOC.indexOf('\n<a id="', start + 1);
      const section = DOC.slice(start, next < 0 ? undefined : next);
      expect({ key, named: section.includes(`\`${key}\``) }).toEqual({ key, named: true });
    }
  });
});

describe('methodsLinkFor', () => {
  it('plan and sky keys: the Methods page with the fragment; unknown keys: null', () => {
    expect(methodsLinkFor('completeness')).toBe('/methods#completeness');
    expect(methodsLinkFor('longestGapNights')).toBe('/methods#longest-gap');
    expect(methodsLinkFor('noSuchQuantity')).toBeNull();
  });
});
