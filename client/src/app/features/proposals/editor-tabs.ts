/** The editor's tabs, in order; each is a child route of /proposals/:id. */
export const EDITOR_TABS = [
  { path: 'overview', label: 'Overview' },
  { path: 'team', label: 'Team' },
  { path: 'targets', label: 'Targets' },
  { path: 'plans', label: 'Plans' },
  { path: 'justification', label: 'Justification' },
  { path: 'submit', label: 'Submit' },
] as const;

export type EditorTab = (typeof EDITOR_TABS)[number]['path'];

/**
 * The tab where a readiness problem is fixed, from the field it names (`abstract`,
 * `nodeIds`, `targets.3.raDeg`, `justification`, `team`...).
 */
export function tabForField(field: string): EditorTab {
  const head = field.split(/[.[]/)[0];
  switch (head) {
    case 'team':
    case 'members':
      return 'team';
    case 'targets':
      return 'targets';
    case 'plans':
      return 'plans';
    case 'justification':
      return 'justification';
    case 'call':
    case 'callClosesAt':
    case 'deadline':
      return 'submit';
    default:
      return 'overview';
  }
}
