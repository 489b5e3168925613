import { layoutColumns, stateLine, type WordMeasure } from './summary-pdf';

/** Every character 5 points wide, headings and cells alike. */
const FIVE_POINTS: WordMeasure = { heading: (word) => 5 * word.length, cell: (word) => 5 * word.length };
const widths = (columns: { width: number }[]) => columns.map((c) => Math.round(c.width * 100) / 100);
const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);

describe('stateLine', () => {
  it('submitted: the state names its date itself, the word said once', () => {
    expect(stateLine({ state: 'submitted', submittedAt: '2027-01-10T12:00:05.000Z' })).toBe('Submitted on 10 Jan 2027, 12:00 UTC');
  });

  it('later states keep the submission date after the state; a draft has none', () => {
    expect(stateLine({ state: 'in_review', submittedAt: '2027-01-10T12:00:05.000Z' })).toBe(
      'In review; submitted on 10 Jan 2027, 12:00 UTC',
    );
    expect(stateLine({ state: 'draft', submittedAt: null })).toBe('Draft');
  });
});

describe('layoutColumns', () => {
  it('words that fit: the preferred widths, scaled to the table', () => {
    const columns = layoutColumns(
      [
        { title: 'Node', width: 100 },
        { title: 'Fee', width: 100 },
      ],
      [['KRG-50', 'EUR 10.00']],
      400,
      FIVE_POINTS,
    );
    expect(widths(columns)).toEqual([200, 200]);
  });

  it('a heading word wider than its column: the column takes the word whole (with padding), the others give way', () => {
    // "Node-hours" is 50 points: 55 with padding and slack, more than its preferred 40.
    const columns = layoutColumns(
      [
        { title: 'Visits', width: 80 },
        { title: 'Node-hours', width: 40 },
        { title: 'Feasible', width: 80 },
      ],
      [['140', '123.45', 'yes']],
      200,
      FIVE_POINTS,
    );
    expect(widths(columns)[1]).toBe(55);
    expect(sum(columns.map((c) => c.width))).toBeCloseTo(200, 6);
    for (const c of columns) expect(c.width).toBeGreaterThanOrEqual(5 * Math.max(...c.title.split(' ').map((w) => w.length)) + 5);
  });

  it('a heading wraps at its spaces: only its widest word sets the minimum', () => {
    const columns = layoutColumns(
      [
        { title: 'Period range (d)', width: 10 },
        { title: 'Name', width: 190 },
      ],
      [],
      200,
      FIVE_POINTS,
    );
    expect(widths(columns)[0]).toBe(35); // "Period", "range": 30 points, plus 5
  });

  it('cells too wide for the page together: the heading words still stay whole, the cells wrap', () => {
    const columns = layoutColumns(
      [
        { title: 'Name', width: 50 },
        { title: 'Fee', width: 50 },
      ],
      [['An-extremely-long-unbroken-target-name', 'EUR 1,000,000.00']],
      100,
      FIVE_POINTS,
    );
    expect(sum(columns.map((c) => c.width))).toBeCloseTo(100, 6);
    expect(columns[0].width).toBeGreaterThanOrEqual(25);
    expect(columns[1].width).toBeGreaterThanOrEqual(20);
  });
});
