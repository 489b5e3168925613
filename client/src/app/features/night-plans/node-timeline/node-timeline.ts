import { ChangeDetectionStrategy, Component, computed, effect, inject, input, LOCALE_ID, output, signal, untracked } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatTooltip } from '@angular/material/tooltip';
import { VISIT_STATUS_LABELS, type NightPlanNode, type TimelineNight, type VisitStatus } from '@spincycle/shared/night-plans/night-plans';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { formatDay } from '../../../ui/time/date-format';
import { formatPercent } from '../../../ui/units/format-units';
import { campaignMonths, siteClock, siteNoon, type MonthWindow } from '../night-plan-format';
import { NightPlansApi, type TimelineWindow } from '../night-plans-api';

const HOUR = 3_600_000;
/** Colour of a program the overview does not list (should not happen). */
const FALLBACK_COLOUR = 'var(--mat-sys-outline)';

/** One visit block of a night column: vertical position in percent of the axis. */
export interface VisitBlock {
  id: number;
  top: number;
  height: number;
  colour: string;
  status: VisitStatus;
  words: string;
}

/** One night column. */
export interface NightColumn {
  night: TimelineNight;
  day: string;
  weekday: string;
  dark: { top: number; height: number } | null;
  visits: VisitBlock[];
  /** Whole words for the night's button (and the table). */
  label: string;
  darkText: string;
  moonText: string;
}

let nextId = 0;

/**
 * One node's nights, a month at a time: nights across, the hours of the night (site time) down;
 * darkness as a band, each visit a block in its program's colour (planned outlined, done
 * solid, missed striped), the Moon's light as a tint over the night, lost nights hatched and
 * labelled. Each night is a button that opens its plan; a toggle shows the same nights as a table.
 */
@Component({
  selector: 'app-node-timeline',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, MatButton, MatIcon, MatIconButton, MatTooltip],
  templateUrl: './node-timeline.html',
  styleUrl: './node-timeline.scss',
})
export class NodeTimeline {
  readonly cycleId = input.required<number>();
  readonly node = input.required<NightPlanNode>();
  readonly campaignStart = input.required<string>();
  readonly campaignEnd = input.required<string>();
  /** Program colours by proposal id. */
  readonly colours = input<ReadonlyMap<number, string>>(new Map());
  /** Programs' titles by proposal id, for the legend. */
  readonly titles = input<ReadonlyMap<number, string>>(new Map());
  /** Bumped by the page after a build, a re-plan or an upload: reads the month again. */
  readonly refresh = input(0);
  /** Today's date (`YYYY-MM-DD`): the timeline opens on its month when it lies in the campaign. */
  readonly today = input(new Date().toISOString().slice(0, 10));
  readonly nightChosen = output<string>();

  private readonly api = inject(NightPlansApi);
  private readonly locale = inject(LOCALE_ID);
  protected readonly uid = `timeline-${++nextId}`;

  protected readonly months = computed(() => campaignMonths(this.campaignStart(), this.campaignEnd(), this.locale));
  protected readonly monthIndex = signal(0);
  protected readonly month = computed<MonthWindow | null>(() => this.months()[this.monthIndex()] ?? null);
  protected readonly showTable = signal(false);

  /** What to read; equal windows do not read again when the page hands in a fresh copy of the node. */
  private readonly window = computed<TimelineWindow | null>(
    () => {
      const m = this.month();
      return m ? { cycleId: this.cycleId(), nodeId: this.node().nodeId, from: m.from, to: m.to } : null;
    },
    { equal: (a, b) => a === b || (!!a && !!b && a.cycleId === b.cycleId && a.nodeId === b.nodeId && a.from === b.from && a.to === b.to) },
  );
  protected readonly timeline = this.api.timelineResource(this.window);
  protected readonly nights = computed(() => (this.timeline.hasValue() ? this.timeline.value().nights : []));
  protected readonly error = computed(() => loadErrorText(this.timeline.error(), 'The nights of this node could not be loaded.'));
  protected readonly statusLabels = VISIT_STATUS_LABELS;

  constructor() {
    // Open on today's month when the campaign is running.
    effect(() => {
      const today = this.today();
      const i = this.months().findIndex((m) => m.from <= today && today <= m.to);
      untracked(() => this.monthIndex.set(Math.max(0, i)));
    });
    // A later bump of `refresh` reads the month again (the first value is the one it was created with).
    let seen: number | null = null;
    effect(() => {
      const n = this.refresh();
      if (seen !== null && n !== seen) untracked(() => this.timeline.reload());
      seen = n;
    });
  }

  /** The hours axis, in hours after the site's noon: from the earliest dusk to the latest dawn of the month. */
  protected readonly axis = computed(() => {
    const tz = this.node().timeZone;
    let lo = Infinity;
    let hi = -Infinity;
    for (const night of this.nights()) {
      const noon = siteNoon(night.date, tz);
      const times = [night.darkStart, night.darkEnd, ...night.visits.flatMap((v) => [v.start, v.end])].filter((t): t is string => !!t);
      for (const t of times) {
        const h = (Date.parse(t) - noon) / HOUR;
        lo = Math.min(lo, h);
        hi = Math.max(hi, h);
      }
    }
    if (!Number.isFinite(lo) || hi <= lo) return { lo: 6, hi: 18 };
    return { lo: Math.max(0, Math.floor(lo)), hi: Math.min(24, Math.ceil(hi)) };
  });

  protected readonly ticks = computed(() => {
    const { lo, hi } = this.axis();
    const step = hi - lo > 8 ? 2 : 1;
    const ticks: { at: number; label: string }[] = [];
    for (let h = Math.ceil(lo / step) * step; h <= hi; h += step) {
      ticks.push({ at: ((h - lo) / (hi - lo)) * 100, label: `${String((12 + h) % 24).padStart(2, '0')}:00` });
    }
    return ticks;
  });

  protected readonly columns = computed<NightColumn[]>(() => {
    const tz = this.node().timeZone;
    const { lo, hi } = this.axis();
    const colours = this.colours();
    const pos = (noon: number, t: string) => (((Date.parse(t) - noon) / HOUR - lo) / (hi - lo)) * 100;
    const weekday = new Intl.DateTimeFormat(this.locale, { weekday: 'short', timeZone: 'UTC' });
    return this.nights().map((night) => {
      const noon = siteNoon(night.date, tz);
      const dark =
        night.darkStart && night.darkEnd
          ? { top: pos(noon, night.darkStart), height: pos(noon, night.darkEnd) - pos(noon, night.darkStart) }
          : null;
      const visits = night.visits.map<VisitBlock>((v) => ({
        id: v.id,
        top: pos(noon, v.start),
        height: Math.max(1.2, pos(noon, v.end) - pos(noon, v.start)),
        colour: colours.get(v.proposalId) ?? FALLBACK_COLOUR,
        status: v.status,
        words: `${v.targetName} (${v.programTitle}) ${siteClock(v.start, tz)}–${siteClock(v.end, tz)}, ${VISIT_STATUS_LABELS[v.status].toLowerCase()}`,
      }));
      const darkText =
        night.darkStart && night.darkEnd ? `dark ${siteClock(night.darkStart, tz)}–${siteClock(night.darkEnd, tz)}` : 'never dark';
      const moonText = `Moon ${formatPercent(night.moonIllumination, this.locale)} lit`;
      const done = night.visits.filter((v) => v.status === 'done').length;
      const missed = night.visits.filter((v) => v.status === 'missed').length;
      const count = night.visits.length;
      const parts = [
        formatDay(night.date, this.locale),
        night.lost ? `lost: ${night.lost.reason}` : null,
        count ? `${count} ${count === 1 ? 'visit' : 'visits'}` + (done || missed ? ` (${done} done, ${missed} missed)` : '') : 'no visits',
        darkText,
        moonText,
      ].filter((p): p is string => p !== null);
      const date = new Date(`${night.date}T00:00:00Z`);
      const day = String(date.getUTCDate());
      const weekdayText = weekday.format(date);
      // The name starts with what the button shows, in its order ("Lost", day, weekday), as WCAG's label-in-name asks.
      const shown = `${night.lost ? 'Lost ' : ''}${day} ${weekdayText}`;
      return {
        night,
        day,
        weekday: weekdayText,
        dark,
        visits,
        label: `${shown}: ${parts.join(', ')}`,
        darkText,
        moonText,
      };
    });
  });

  /** The programs seen in this month, for the legend. */
  protected readonly legend = computed(() => {
    const ids = [...new Set(this.nights().flatMap((n) => n.visits.map((v) => v.proposalId)))];
    const titles = new Map(this.nights().flatMap((n) => n.visits.map((v) => [v.proposalId, v.programTitle] as const)));
    return ids
      .map((id) => ({ id, title: this.titles().get(id) ?? titles.get(id) ?? '', colour: this.colours().get(id) ?? FALLBACK_COLOUR }))
      .sort((a, b) => a.title.localeCompare(b.title));
  });

  protected previous(): void {
    this.monthIndex.update((i) => Math.max(0, i - 1));
  }

  protected next(): void {
    this.monthIndex.update((i) => Math.min(this.months().length - 1, i + 1));
  }

  /** Left and right arrows (and Home, End) move between the nights' buttons. */
  protected moveFocus(event: KeyboardEvent): void {
    const current = event.target as HTMLElement;
    if (!current.classList.contains('night')) return;
    const buttons = [...(current.closest('ul')?.querySelectorAll<HTMLButtonElement>('button.night') ?? [])];
    const i = buttons.indexOf(current as HTMLButtonElement);
    const next =
      event.key === 'ArrowRight'
        ? i + 1
        : event.key === 'ArrowLeft'
          ? i - 1
          : event.key === 'Home'
            ? 0
            : event.key === 'End'
              ? buttons.length - 1
              : null;
    if (next === null || next < 0 || next >= buttons.length) return;
    event.preventDefault();
    buttons[next].focus();
  }

  protected visitClock(iso: string): string {
    return siteClock(iso, this.node().timeZone);
  }
}
