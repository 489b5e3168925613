import { existsSync } from 'node:fs';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import { formatUtcInstant } from '@spincycle/shared/cycles/cycle-schemas';
import type { Proposal } from '@spincycle/shared/proposals/proposal-schemas';
import type { TargetPlanRow } from '@spincycle/shared/proposals/plan-types';
import { formatMinorUnits } from '@spincycle/shared/proposals/money';
import { PROPOSAL_STATE_LABELS } from '@spincycle/shared/proposals/proposal-states';
import { formatDecDms, formatRaHms } from '@spincycle/shared/proposals/sexagesimal';
import type { TargetRow } from '@spincycle/shared/proposals/target-schemas';
import { FEE_CAUTION, totalsByCurrency } from './receipt-mail';

/** What the printed summary shows. */
export interface SummaryPdfInput {
  proposal: Proposal;
  targets: TargetRow[];
  plans: TargetPlanRow[];
  plansCurrent: boolean;
  generatedAt: Date;
}

const FONT_DIR = path.resolve(__dirname, '../../../../../node_modules/@fontsource/ibm-plex-sans/files');
const FONT_FILES = { regular: 'ibm-plex-sans-latin-400-normal.woff', bold: 'ibm-plex-sans-latin-700-normal.woff' };

/** IBM Plex Sans from @fontsource when present (the app's font), else the PDF standard Helvetica. */
export function fonts(doc: PDFKit.PDFDocument): { regular: string; bold: string } {
  const regular = path.join(FONT_DIR, FONT_FILES.regular);
  const bold = path.join(FONT_DIR, FONT_FILES.bold);
  if (existsSync(regular) && existsSync(bold)) {
    doc.registerFont('plex', regular);
    doc.registerFont('plex-bold', bold);
    return { regular: 'plex', bold: 'plex-bold' };
  }
  return { regular: 'Helvetica', bold: 'Helvetica-Bold' };
}

/** A table column as the summary asks for it. */
export interface Column {
  title: string;
  /** Preferred width in points; `layoutColumns` widens a column its words do not fit. */
  width: number;
  align?: 'left' | 'right';
}

const MARGIN = 48;
/** Points between a cell's text and its column's edges (2 on each side). */
const CELL_PADDING = 4;
/** pdfkit wraps a word that is exactly as wide as the line: keep a point of room. */
const FIT_SLACK = 1;
const num = (v: number, digits = 1) => v.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });

/**
 * The printable summary of a proposal (A4, pdfkit): title, cycle, team, abstract, the request
 * per node, and per node the target table. `compress: false` (tests) leaves the content
 * streams readable.
 */
export function renderProposalSummaryPdf(input: SummaryPdfInput, options: { compress?: boolean } = {}): Promise<Buffer> {
  const { proposal } = input;
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    compress: options.compress ?? true,
    bufferPages: true,
    info: { Title: proposal.title, Subject: `Proposal summary, cycle ${proposal.cycle.code}`, Creator: 'Spincycle' },
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const f = fonts(doc);
  const width = doc.page.width - 2 * MARGIN;
  const bottom = () => doc.page.height - MARGIN - 24;

  const heading = (text: string, size = 13) => {
    if (doc.y > bottom() - 60) doc.addPage();
    doc.moveDown(0.6).font(f.bold).fontSize(size).fillColor('#1f2350').text(text, MARGIN, doc.y, { width });
    doc.moveDown(0.3).font(f.regular).fontSize(9.5).fillColor('#111111');
  };
  const pair = (label: string, value: string) => {
    doc.font(f.bold).fontSize(9.5).text(`${label}: `, MARGIN, doc.y, { continued: true, width }).font(f.regular).text(value);
  };
  const table = (wanted: Column[], rows: string[][]) => {
    const columns = layoutColumns(wanted, rows, width, {
      heading: (word) => doc.font(f.bold).fontSize(8).widthOfString(word),
      cell: (word) => doc.font(f.regular).fontSize(8).widthOfString(word),
    });
    const drawRow = (cells: string[], bold: boolean) => {
      if (doc.y > bottom()) {
        doc.addPage();
        drawRow(
          columns.map((c) => c.title),
          true,
        );
      }
      const y = doc.y;
      let x = MARGIN;
      doc.font(bold ? f.bold : f.regular).fontSize(8);
      let height = 0;
      cells.forEach((cell, i) => {
        const c = columns[i];
        doc.text(cell, x + CELL_PADDING / 2, y, { width: c.width - CELL_PADDING, align: c.align ?? 'left' });
        height = Math.max(height, doc.y - y);
        x += c.width;
      });
      doc.y = y + height + 2;
      doc
        .moveTo(MARGIN, doc.y - 1)
        .lineTo(MARGIN + width, doc.y - 1)
        .lineWidth(bold ? 0.8 : 0.3)
        .strokeColor('#9aa0b4')
        .stroke();
    };
    drawRow(
      columns.map((c) => c.title),
      true,
    );
    for (const r of rows) drawRow(r, false);
    doc.x = MARGIN;
  };

  // Title block.
  doc.font(f.bold).fontSize(18).fillColor('#1f2350').text(proposal.title, { width });
  doc.moveDown(0.3).font(f.regular).fontSize(10).fillColor('#444444');
  doc.text(`Cycle ${proposal.cycle.code}: ${proposal.cycle.title}. Call closes ${formatUtcInstant(proposal.cycle.callClosesAt)}.`, {
    width,
  });
  doc.text(`${stateLine(proposal)}. Category: ${proposal.category ?? 'not chosen'}.`, { width });
  doc.fillColor('#111111');

  heading('Team');
  for (const m of proposal.team) {
    const who = m.status === 'active' ? `${m.displayName ?? m.email} <${m.email}>` : `${m.email} (invited)`;
    pair(m.role === 'pi' ? 'PI' : 'Co-I', who);
  }

  heading('Abstract');
  doc
    .font(f.regular)
    .fontSize(9.5)
    .text(proposal.abstract || '(no abstract yet)', { width, align: 'left' });

  heading('Time requested per node');
  const requestRows = proposal.request.map((r) => [
    r.nodeCode,
    String(r.targets),
    String(r.infeasibleTargets),
    num(r.nodeHours, 2),
    formatMinorUnits(r.feeMinor, r.currency),
  ]);
  for (const t of totalsByCurrency(proposal.request))
    requestRows.push(['Total', '', '', num(t.nodeHours, 2), formatMinorUnits(t.feeMinor, t.currency)]);
  table(
    [
      { title: 'Node', width: 110 },
      { title: 'Target plans', width: 80, align: 'right' },
      { title: 'Infeasible', width: 70, align: 'right' },
      { title: 'Node-hours', width: 100, align: 'right' },
      { title: 'Fee', width: width - 360, align: 'right' },
    ],
    requestRows,
  );
  doc.moveDown(0.4).font(f.regular).fontSize(8).fillColor('#444444').text(FEE_CAUTION, MARGIN, doc.y, { width });
  if (!input.plansCurrent) doc.text('The target plans are out of date: the targets or nodes changed since they were computed.', { width });
  doc.fillColor('#111111');

  const targetsById = new Map(input.targets.map((t) => [t.id, t]));
  const nodes = [...new Set(input.plans.map((p) => p.nodeCode))];
  if (!nodes.length) {
    heading('Targets');
    table(
      [
        { title: 'Name', width: 140 },
        { title: 'RA (J2000)', width: 80 },
        { title: 'Dec (J2000)', width: 80 },
        { title: 'Mag', width: 60, align: 'right' },
        { title: 'Colour', width: 70, align: 'right' },
        { title: 'Age (Myr)', width: width - 430, align: 'right' },
      ],
      input.targets.map((t) => [
        t.name,
        formatRaHms(t.raDeg),
        formatDecDms(t.decDeg),
        `${num(t.magnitude, 2)} ${t.magnitudeBand}`,
        `${num(t.colour, 2)} ${t.colourSystem}`,
        ageText(t),
      ]),
    );
  }
  for (const nodeCode of nodes) {
    heading(`Targets on ${nodeCode}`);
    table(
      [
        { title: 'Name', width: 78 },
        { title: 'RA (J2000)', width: 58 },
        { title: 'Dec (J2000)', width: 54 },
        { title: 'Mag', width: 38, align: 'right' },
        { title: 'Colour', width: 50, align: 'right' },
        { title: 'Age (Myr)', width: 52, align: 'right' },
        { title: 'Period range (d)', width: 62, align: 'right' },
        { title: 'Visits', width: 34, align: 'right' },
        { title: 'Node-hours', width: 44, align: 'right' },
        { title: 'Feasible', width: width - 470 },
      ],
      input.plans
        .filter((p) => p.nodeCode === nodeCode)
        .map((p) => {
          const t = targetsById.get(p.targetId)!;
          return [
            t.name,
            formatRaHms(t.raDeg),
            formatDecDms(t.decDeg),
            `${num(t.magnitude, 2)} ${t.magnitudeBand}`,
            `${num(t.colour, 2)} ${t.colourSystem}`,
            ageText(t),
            `${num(p.shortestPeriodDays)}–${num(p.longestPeriodDays)}`,
            String(p.visits),
            num(p.nodeHours, 2),
            p.feasible ? 'yes' : 'no',
          ];
        }),
    );
  }

  // Footer on every page: generation instant and page numbers.
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    doc.font(f.regular).fontSize(7.5).fillColor('#666666');
    // Writing inside the bottom margin would make pdfkit start a new page: lift the margin meanwhile.
    const margins = doc.page.margins;
    doc.page.margins = { ...margins, bottom: 0 };
    const y = doc.page.height - MARGIN + 8;
    doc.text(
      `Generated by Spincycle at ${formatUtcInstant(input.generatedAt.toISOString())}. The team's copy; page ${i + 1} of ${range.count}.`,
      MARGIN,
      y,
      {
        width,
        lineBreak: false,
      },
    );
    doc.page.margins = margins;
  }
  doc.end();
  return done;
}

function ageText(t: TargetRow): string {
  return t.ageUncertaintyMyr ? `${num(t.ageMyr, 0)} ± ${num(t.ageUncertaintyMyr, 0)}` : num(t.ageMyr, 0);
}

/**
 * `Submitted on 10 Jan 2027, 12:00 UTC`, `In review; submitted on …`, `Draft`. The submitted
 * state names its date itself: "Submitted, submitted …" would say the same word twice.
 */
export function stateLine(proposal: Pick<Proposal, 'state' | 'submittedAt'>): string {
  const label = PROPOSAL_STATE_LABELS[proposal.state];
  if (!proposal.submittedAt) return label;
  const on = `on ${formatUtcInstant(proposal.submittedAt)}`;
  return proposal.state === 'submitted' ? `${label} ${on}` : `${label}; submitted ${on}`;
}

/** Widths in points of a word as a heading (bold) and as a cell (regular). */
export interface WordMeasure {
  heading: (word: string) => number;
  cell: (word: string) => number;
}

/**
 * The columns' widths on a table `total` points wide, chosen from the words they hold: a
 * heading wraps only at its spaces, never inside a word ("Node-hours" is not split at its
 * hyphen), and a cell's words stay whole too where the page has room. Each column gets at
 * least its widest word; the room left goes to the columns still short of their preferred
 * width, in proportion to what each lacks (none grows past it unless its words need more). When
 * the cells' words cannot all fit, only the headings' words are kept whole (long cell text
 * then wraps as pdfkit breaks it).
 */
export function layoutColumns(columns: readonly Column[], rows: readonly string[][], total: number, measure: WordMeasure): Column[] {
  const widest = (texts: string[], width: (word: string) => number) =>
    Math.max(0, ...texts.flatMap((text) => text.split(/\s+/).filter(Boolean)).map(width));
  const headingNeed = columns.map((c) => widest([c.title], measure.heading) + CELL_PADDING + FIT_SLACK);
  const cellNeed = columns.map((c, i) =>
    Math.max(
      headingNeed[i],
      widest(
        rows.map((r) => r[i] ?? ''),
        measure.cell,
      ) +
        CELL_PADDING +
        FIT_SLACK,
    ),
  );
  const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
  const need = sum(cellNeed) <= total ? cellNeed : headingNeed;
  const spare = Math.max(0, total - sum(need));
  // Share the spare room so that each column comes as close to its preferred width as it can.
  const preferred = columns.map((c) => c.width * (total / sum(columns.map((x) => x.width))));
  const shortfall = preferred.map((p, i) => Math.max(0, p - need[i]));
  const short = sum(shortfall);
  return columns.map((c, i) => ({
    ...c,
    width: need[i] + (short > 0 ? (spare * shortfall[i]) / short : spare / columns.length),
  }));
}
