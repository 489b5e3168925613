import { stringify } from 'csv-stringify/sync';
import { stripControlCharacters } from '@spincycle/shared/http/text';
import type { PanelStanding, PanelStatisticsReport } from '@spincycle/shared/review/standing';
import { escapeFormulaCell } from '../../proposals/targets/target-csv';

/** A stored text as a cell: control characters removed, formula-escaped (OWASP CSV injection). */
const text = (value: string) => escapeFormulaCell(stripControlCharacters(value));
/** A number rounded for the sheet; empty for none. */
const num = (value: number | null, decimals: number) => (value === null ? '' : Number(value.toFixed(decimals)));
const yesNo = (value: boolean) => (value ? 'yes' : 'no');

/**
 * The panel's grade matrix: one row per proposal the viewer may see (merit order), per reviewer
 * the raw grade and its normalised value, then the proposal's statistics. The PI and
 * affiliation columns are there only when the viewer may see the team.
 */
export function writeMatrixCsv(report: PanelStatisticsReport): string {
  const withTeam = !report.panel.teamHidden;
  const head = [
    'proposal_id',
    'title',
    ...(withTeam ? ['pi', 'pi_affiliation'] : []),
    ...report.reviewers.flatMap((r) => [`${text(r.displayName)} grade`, `${text(r.displayName)} normalised`]),
    'mean',
    'median',
    'normalised_mean',
    'spread',
    'flagged',
    'not_discussed',
  ];
  const rows = report.proposals.map((p) => {
    const grades = new Map(p.grades.map((g) => [g.reviewerId, g]));
    return [
      p.proposalId,
      text(p.title),
      ...(withTeam ? [text(p.team?.piName ?? ''), text(p.team?.piAffiliation ?? '')] : []),
      ...report.reviewers.flatMap((r) => {
        const g = grades.get(r.id);
        return g ? [num(g.raw, 1), num(g.normalised, 3)] : ['', ''];
      }),
      num(p.mean, 2),
      num(p.median, 2),
      num(p.normalisedMean, 3),
      num(p.spread, 1),
      yesNo(p.flagged),
      yesNo(p.notDiscussed),
    ];
  });
  return stringify([head, ...rows], { record_delimiter: 'windows' });
}

/** The standing: position, proposal, its statistics and flags (no team columns for anyone). */
export function writeStandingCsv(standing: PanelStanding): string {
  const head = ['position', 'proposal_id', 'title', 'normalised_mean', 'mean', 'median', 'spread', 'flagged', 'not_discussed'];
  const rows = standing.entries.map(({ position, proposal: p }) => [
    position,
    p.proposalId,
    text(p.title),
    num(p.normalisedMean, 3),
    num(p.mean, 2),
    num(p.median, 2),
    num(p.spread, 1),
    yesNo(p.flagged),
    yesNo(p.notDiscussed),
  ]);
  return stringify([head, ...rows], { record_delimiter: 'windows' });
}
