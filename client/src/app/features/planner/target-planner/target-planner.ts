import { DecimalPipe } from '@angular/common';
import type { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, effect, inject, LOCALE_ID, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatCheckbox } from '@angular/material/checkbox';
import { ErrorStateMatcher, MatOption } from '@angular/material/core';
import { MatExpansionPanel, MatExpansionPanelHeader, MatExpansionPanelTitle } from '@angular/material/expansion';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSelect } from '@angular/material/select';
import { type CycleSummary, NODE_BANDS, type TelescopeNode } from '@spincycle/shared/facility/facility-types';
import type { ApiErrorBody } from '@spincycle/shared/http/api-error';
import { computeNodeTargetPlan, type NodeTargetPlan, type PlanSuggestion } from '@spincycle/shared/planning/node-target-plan';
import { targetWindowsFromReport } from '@spincycle/shared/planning/sky-report-adapter';
import type { SkyWindowsRequest, SkyWindowsResponse } from '@spincycle/shared/planning/sky-windows-request';
import {
  colourLabel,
  deredden,
  DWARF_SEQUENCE,
  dwarfSequenceAt,
  redden,
  type TargetColourSystem,
} from '@spincycle/shared/science/colour-sequence';
import type { ScienceFlag } from '@spincycle/shared/science/explained';
import { GYRO_RELATION_INFO, GYRO_RELATIONS, SUPPORTED_COLOUR_DOMAIN } from '@spincycle/shared/science/gyrochronology';
import { isScienceInputError } from '@spincycle/shared/science/science-input-error';
import {
  computeTargetPlan,
  defaultRelationFor,
  type TargetPlan,
  type TargetPlanOptions,
  type TargetPlanTarget,
} from '@spincycle/shared/science/target-plan';
import type { CadenceAssessment } from '@spincycle/shared/sky/cadence-assessment';
import { parseRaDec } from '@spincycle/shared/sky/ra-dec-parser';
import { SkyInputError } from '@spincycle/shared/sky/sky-input-error';
import type { NightDarkReport, TargetWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import { catchError, debounceTime, distinctUntilChanged, map, of, pairwise, startWith, switchMap, type Observable } from 'rxjs';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { SkyWindowChart } from '../../../ui/charts/sky-window-chart/sky-window-chart';
import { formatMinorCurrency, formatPercent } from '../../../ui/units/format-units';
import { GyrochroneChart } from '../gyrochrone-chart/gyrochrone-chart';
import { gyrochroneSeries, periodColourSeries, type StarMarker } from '../gyro-curves';
import { PeriodColourChart } from '../period-colour-chart/period-colour-chart';
import {
  allQuantityRows,
  completenessPrices,
  formatValue,
  keyRows,
  noExpectedPeriodFlag,
  noExpectedPeriodReason,
  searchBandSentence,
  SEVERITY_LABELS,
  TAG_DESCRIPTIONS,
} from '../plan-display';
import {
  COMPLETENESS_PERCENT_RANGE,
  controlForScienceField,
  controlForSkyField,
  createPlannerForm,
  type FieldErrors,
  missingFields,
  type PlannerField,
  type PlannerValue,
  RECOMPUTE_DEBOUNCE_MS,
  sentence,
  toPlanInput,
} from '../planner-form';
import { PlannerApi } from '../planner-api';
import { SkyWindowsApi } from '../sky-windows-api';

/** The plan of the form's current value, or why there is none. */
type PlanState =
  | { kind: 'waiting' }
  | { kind: 'invalid'; fieldErrors: FieldErrors; message: string }
  | { kind: 'ok'; plan: TargetPlan; node: TelescopeNode; target: TargetPlanTarget; options: TargetPlanOptions };

/** Whether the sky windows can be asked for. */
type SkyInput =
  | { kind: 'off'; hint: string }
  | { kind: 'invalid'; fieldErrors: FieldErrors }
  | { kind: 'ready'; request: SkyWindowsRequest };

type SkyState =
  | { kind: 'idle' }
  | { kind: 'loading'; nodeCount: number }
  | { kind: 'error'; error: ApiErrorBody }
  | { kind: 'done'; response: SkyWindowsResponse };

/** One node's plan against its sky windows, or why there is none. */
type NodePlanState = { kind: 'ok'; combined: NodeTargetPlan } | { kind: 'error'; note: string };

/** One node's sky-window chart with the plan's verdict on it. */
interface SkyPanel {
  nodeId: number;
  heading: string;
  target: TargetWindowsReport;
  nights: NightDarkReport[];
  assessment: CadenceAssessment | null;
  feasible: boolean | null;
  reasons: string[];
  suggestions: PlanSuggestion[];
  note: string | null;
}

/** Field names as the page says them (in messages that list several fields). */
const FIELD_LABELS: Readonly<Record<PlannerField, string>> = {
  starName: 'Star name',
  colourSystem: 'Colour system',
  colourValue: 'Colour',
  reddeningEbv: 'E(B−V)',
  ageMyr: 'Age',
  ageUncertaintyMyr: 'Age uncertainty',
  magnitude: 'Magnitude',
  band: 'Band',
  periodDays: 'Period',
  periodUncertaintyDays: 'Period uncertainty',
  nodeId: 'Node',
  exposureMode: 'Exposure',
  exposureSeconds: 'Exposure',
  relation: 'Relation',
  falseAlarmProbability: 'False-alarm probability',
  completenessPercent: 'Completeness',
  ra: 'Right ascension',
  dec: 'Declination',
  cycleId: 'Cycle',
  compareNodeIds: 'Nodes to compare',
};

const STATUS_ORDER: Readonly<Record<CycleSummary['status'], number>> = { open: 0, upcoming: 1, closed: 2 };

/**
 * The target planner: a star's expected period, amplitude, precision, cadence, visits,
 * node-hours and fee on one node, recomputed in the browser as the inputs change, with
 * gyrochrone charts and, given RA/Dec and a cycle, the sky window from one or several nodes.
 */
@Component({
  selector: 'app-target-planner',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DecimalPipe,
    GyrochroneChart,
    LoadStatus,
    MatButton,
    MatButtonToggle,
    MatButtonToggleGroup,
    MatCheckbox,
    MatError,
    MatExpansionPanel,
    MatExpansionPanelHeader,
    MatExpansionPanelTitle,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    MatSuffix,
    PeriodColourChart,
    ReactiveFormsModule,
    SkyWindowChart,
  ],
  templateUrl: './target-planner.html',
  styleUrl: './target-planner.scss',
})
export default class TargetPlanner {
  private readonly api = inject(PlannerApi);
  private readonly skyApi = inject(SkyWindowsApi);
  private readonly locale = inject(LOCALE_ID);

  protected readonly nodes = this.api.nodesResource();
  protected readonly cycles = this.api.cyclesResource();

  protected readonly form = createPlannerForm();
  /** The "pick a star type" helper: fills the colour, not part of the plan's input. */
  protected readonly starType = new FormControl<string | null>(null);

  protected readonly bands = NODE_BANDS;
  protected readonly relations = GYRO_RELATIONS.map((id) => GYRO_RELATION_INFO[id]);
  protected readonly starTypes = DWARF_SEQUENCE.map((row) => row.spectralType);
  protected readonly tagDescriptions = TAG_DESCRIPTIONS;
  protected readonly severityLabels = SEVERITY_LABELS;
  protected readonly completenessRange = COMPLETENESS_PERCENT_RANGE;

  private readonly value$: Observable<PlannerValue> = this.form.valueChanges.pipe(map(() => this.form.getRawValue()));
  /** The form's value as typed (for hints and toggles). */
  protected readonly live = toSignal(this.value$, { initialValue: this.form.getRawValue() });
  /** The form's value once typing pauses: what the plan and the sky windows follow. */
  private readonly settled = toSignal(this.value$.pipe(debounceTime(RECOMPUTE_DEBOUNCE_MS)), { initialValue: this.form.getRawValue() });

  // ---- nodes and cycles ------------------------------------------------------------------

  protected readonly activeNodes = computed(() =>
    (this.nodes.hasValue() ? this.nodes.value() : []).filter((node) => node.active && node.site).sort((a, b) => a.code.localeCompare(b.code)),
  );
  private readonly nodeById = computed(() => new Map(this.activeNodes().map((node) => [node.id, node])));
  protected readonly selectedNode = computed(() => this.nodeById().get(this.live().nodeId ?? -1) ?? null);
  protected readonly nodesError = computed(() => loadErrorText(this.nodes.error(), 'The nodes could not be loaded.'));
  protected readonly nodesEmpty = computed(() => this.nodes.hasValue() && this.activeNodes().length === 0);
  protected readonly loading = computed(() => this.nodes.isLoading() || this.cycles.isLoading());

  protected readonly cycleOptions = computed(() =>
    (this.cycles.hasValue() ? this.cycles.value() : [])
      .slice()
      .sort((a, b) => STATUS_ORDER[a.status] - STATUS_ORDER[b.status] || a.campaignStart.localeCompare(b.campaignStart)),
  );
  protected readonly cyclesError = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));

  // ---- hints -------------------------------------------------------------------------------

  protected readonly colourName = computed(() => colourLabel(this.live().colourSystem));
  protected readonly colourRangeHint = computed(() => {
    const d = SUPPORTED_COLOUR_DOMAIN[this.live().colourSystem];
    return `${d.minExclusive ? 'above ' : ''}${d.min} to ${d.max} mag (F5V–M5V dwarfs)`;
  });
  /** The nearest dwarf type of the typed colour (after E(B−V)), or null outside the table. */
  protected readonly nearestType = computed(() => {
    const v = this.live();
    if (v.colourValue === null) return null;
    try {
      const intrinsic = deredden({ value: v.colourValue, system: v.colourSystem }, v.reddeningEbv ?? 0);
      const point = dwarfSequenceAt(v.colourSystem, intrinsic.value);
      return `≈ ${point.nearestSpectralType} dwarf, Teff ≈ ${formatValue(point.teffK, this.locale, { digits: 2 })} K`;
    } catch {
      return null;
    }
  });
  protected readonly defaultRelationLabel = computed(() => GYRO_RELATION_INFO[defaultRelationFor(this.live().colourSystem)].label);
  protected readonly exposureHint = computed(() => {
    const node = this.selectedNode();
    return node ? `seconds, ${node.minExposureSeconds}–${node.maxExposureSeconds} s on ${node.code}` : 'seconds, within the node’s range';
  });

  // ---- the plan ------------------------------------------------------------------------------

  protected readonly planState = computed<PlanState>(() => {
    const value = this.settled();
    const node = this.nodeById().get(value.nodeId ?? -1);
    if (!node) return { kind: 'waiting' };
    const missing = missingFields(value);
    if (Object.keys(missing).length) return { kind: 'invalid', fieldErrors: missing, message: describeErrors(missing) };
    const { target, options } = toPlanInput(value);
    try {
      return { kind: 'ok', plan: computeTargetPlan(target, node, node.site, options), node, target, options };
    } catch (error) {
      if (!isScienceInputError(error)) throw error;
      const field = controlForScienceField(error.field);
      const fieldErrors: FieldErrors = field ? { [field]: sentence(error.reason) } : {};
      return { kind: 'invalid', fieldErrors, message: field ? describeErrors(fieldErrors) : sentence(error.message) };
    }
  });

  /**
   * The plan the results show. Once the sky windows of the chosen node are loaded, it is the
   * proposal's plan (`computeNodeTargetPlan`: the moonlit sky of the usable nights, a baseline
   * lengthened for day-locked periods); until then, the plan under the site's dark sky (the sky
   * row's why line says which).
   */
  protected readonly plan = computed(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    const onSky = this.nodePlans().get(state.node.id);
    return onSky?.kind === 'ok' ? onSky.combined.plan : state.plan;
  });

  /** The blocking "no expected period" flag of the plan: the proposer must give the period. */
  protected readonly noPeriod = computed(() => {
    const plan = this.plan();
    return plan ? noExpectedPeriodFlag(plan) : null;
  });
  /** The period fields are offered when the plan needs them, and stay while they hold a value. */
  protected readonly showPeriodFields = computed(() => {
    const v = this.live();
    return this.noPeriod() !== null || v.periodDays !== null || v.periodUncertaintyDays !== null || !!this.fieldErrors().periodDays;
  });

  protected readonly prices = computed(() => {
    const plan = this.plan();
    return plan && !this.noPeriod() ? completenessPrices(plan, this.locale) : [];
  });
  protected readonly searchBand = computed(() => {
    const plan = this.plan();
    return plan ? searchBandSentence(plan, this.locale) : null;
  });

  protected readonly keyRows = computed(() => {
    const plan = this.plan();
    return plan ? keyRows(plan, this.locale) : [];
  });
  protected readonly allRows = computed(() => {
    const plan = this.plan();
    return plan ? allQuantityRows(plan, this.locale) : [];
  });
  protected readonly flags = computed<ScienceFlag[]>(() => {
    const order = { blocking: 0, caution: 1, info: 2 } as const;
    return (this.plan()?.flags ?? []).slice().sort((a, b) => order[a.severity] - order[b.severity]);
  });

  /** The star on the charts: the plan's period range at the typed age ± 1σ. */
  private readonly star = computed<StarMarker | null>(() => {
    const state = this.planState();
    // Without an expected period there is no point to mark (the relation's number must not be shown).
    if (state.kind !== 'ok' || this.noPeriod()) return null;
    const q = state.plan.quantities;
    const age = state.target.ageMyr;
    const sigma = state.target.ageUncertaintyMyr ?? 0;
    return {
      ageMyr: age,
      // The core cuts the −1σ at 10 % of the age for the period range; the marker does the same.
      ageLowMyr: Math.max(age - sigma, 0.1 * age),
      ageHighMyr: age + sigma,
      periodDays: q.periodDays.value,
      periodLowDays: q.shortestPeriodDays.value,
      periodHighDays: q.longestPeriodDays.value,
      colour: { value: q.intrinsicColourMag.value, system: state.target.colour.system },
    };
  });

  protected readonly gyrochrone = computed(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    return gyrochroneSeries({
      colour: state.target.colour,
      reddeningEbvMag: state.target.reddeningEbvMag,
      relation: state.plan.relation,
      star: this.star(),
    });
  });

  protected readonly periodColour = computed(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    return periodColourSeries({ system: state.target.colour.system, ageMyr: state.target.ageMyr, relation: state.plan.relation, star: this.star() });
  });

  // ---- sky windows ---------------------------------------------------------------------------

  private readonly skyInput = computed<SkyInput>(() => {
    const v = this.settled();
    const ra = v.ra.trim();
    const dec = v.dec.trim();
    if (!ra && !dec) return { kind: 'off', hint: 'Give the right ascension and declination to see the sky window from the node.' };
    if (!ra) return { kind: 'invalid', fieldErrors: { ra: 'Enter the right ascension as well.' } };
    if (!dec) return { kind: 'invalid', fieldErrors: { dec: 'Enter the declination as well.' } };
    try {
      parseRaDec(ra, dec);
    } catch (error) {
      if (!(error instanceof SkyInputError)) throw error;
      return { kind: 'invalid', fieldErrors: { [error.field === 'dec' ? 'dec' : 'ra']: sentence(error.reason) } };
    }
    if (v.cycleId === null) return { kind: 'off', hint: 'Choose a cycle to see the sky window over its campaign.' };
    const nodeIds = [v.nodeId, ...v.compareNodeIds].filter((id): id is number => id !== null && this.nodeById().has(id));
    const unique = [...new Set(nodeIds)];
    if (!unique.length) return { kind: 'off', hint: 'Choose a node.' };
    // The star's name is left out: the chart does not need it, and renaming must not ask again.
    return { kind: 'ready', request: { cycleId: v.cycleId, nodeIds: unique, targets: [{ ra, dec }], includeNights: true } };
  });

  protected readonly skyHint = computed(() => {
    const input = this.skyInput();
    return input.kind === 'off' ? input.hint : null;
  });

  /** Bumped by "Try again" so that the same request is sent once more. */
  private readonly skyAttempt = signal(0);

  private readonly skyRequest = computed(() => {
    const input = this.skyInput();
    return input.kind === 'ready' ? { request: input.request, attempt: this.skyAttempt() } : null;
  });

  protected readonly sky = toSignal(
    toObservable(this.skyRequest).pipe(
      distinctUntilChanged((a, b) => JSON.stringify(a) === JSON.stringify(b)),
      switchMap((next): Observable<SkyState> => {
        if (!next) return of({ kind: 'idle' });
        return this.skyApi.compute(next.request).pipe(
          map((response): SkyState => ({ kind: 'done', response })),
          catchError((error: HttpErrorResponse) => of<SkyState>({ kind: 'error', error: readApiError(error) })),
          startWith<SkyState>({ kind: 'loading', nodeCount: next.request.nodeIds.length }),
        );
      }),
    ),
    { initialValue: { kind: 'idle' } as SkyState },
  );

  protected readonly skyError = computed(() => {
    const state = this.sky();
    if (state.kind !== 'error') return null;
    const onFields = Object.keys(state.error.fieldErrors ?? {}).some((key) => controlForSkyField(key) !== null);
    return onFields ? 'The sky window could not be computed: see the highlighted fields.' : `The sky window could not be computed. ${state.error.message}`;
  });

  /**
   * The plan on every node whose sky windows are loaded, as the proposal's plans tab computes it
   * on the server (`computeNodeTargetPlan` on the same windows, rebuilt from the report).
   */
  private readonly nodePlans = computed(() => {
    const plans = new Map<number, NodePlanState>();
    const state = this.sky();
    const planState = this.planState();
    if (state.kind !== 'done' || planState.kind !== 'ok') return plans;
    for (const entry of state.response.nodes) {
      const target = entry.report.targets[0];
      const node = this.nodeById().get(entry.nodeId);
      if (!target?.nights || !node) continue;
      try {
        const windows = targetWindowsFromReport(target);
        plans.set(node.id, { kind: 'ok', combined: computeNodeTargetPlan(planState.target, node, node.site, windows, planState.options) });
      } catch (error) {
        if (!isScienceInputError(error) && !(error instanceof SkyInputError)) throw error;
        plans.set(node.id, { kind: 'error', note: `No plan on this node with these inputs: ${sentence(error.message)}` });
      }
    }
    return plans;
  });

  protected readonly skyPanels = computed<SkyPanel[]>(() => {
    const state = this.sky();
    if (state.kind !== 'done') return [];
    const planState = this.planState();
    const nodePlans = this.nodePlans();
    const panels: SkyPanel[] = [];
    for (const entry of state.response.nodes) {
      const target = entry.report.targets[0];
      if (!target) continue;
      const panel: SkyPanel = {
        nodeId: entry.nodeId,
        heading: `${entry.nodeName} (${entry.nodeCode}) at ${entry.siteName}`,
        target,
        nights: entry.report.nights,
        assessment: null,
        feasible: null,
        reasons: [],
        suggestions: [],
        note: null,
      };
      const onSky = nodePlans.get(entry.nodeId);
      if (onSky?.kind === 'ok') {
        panel.assessment = onSky.combined.sky;
        panel.feasible = onSky.combined.feasible;
        panel.reasons = onSky.combined.reasons;
        panel.suggestions = onSky.combined.suggestions;
      } else if (onSky?.kind === 'error') {
        panel.note = onSky.note;
      } else if (planState.kind !== 'ok') {
        panel.note = 'The verdict needs a valid plan: fix the inputs above.';
      }
      panels.push(panel);
    }
    return panels;
  });

  // ---- errors under the fields ----------------------------------------------------------------

  protected readonly fieldErrors = computed<FieldErrors>(() => {
    const errors: FieldErrors = {};
    const sky = this.sky();
    if (sky.kind === 'error') {
      for (const [key, messages] of Object.entries(sky.error.fieldErrors ?? {})) {
        const field = controlForSkyField(key);
        if (field) errors[field] = messages.map(sentence).join(' ');
      }
    }
    const skyInput = this.skyInput();
    if (skyInput.kind === 'invalid') Object.assign(errors, skyInput.fieldErrors);
    const plan = this.planState();
    if (plan.kind === 'invalid') Object.assign(errors, plan.fieldErrors);
    return errors;
  });

  /** Error-state matchers reading `fieldErrors`: a field is red exactly when it has a message. */
  protected readonly matcher = this.createMatchers();

  // ---- the headline ----------------------------------------------------------------------------

  protected readonly headline = computed(() => {
    const state = this.planState();
    if (state.kind === 'waiting') return null;
    if (state.kind === 'invalid') return { tone: 'invalid' as const, title: 'No plan yet', detail: state.message, reason: null, sky: null };
    const { node } = state;
    const plan = this.plan() ?? state.plan;
    const q = plan.quantities;
    const f = (v: number) => formatValue(v, this.locale);
    const skyPanel = this.skyPanels().find((panel) => panel.nodeId === node.id && panel.feasible !== null) ?? null;
    const feasible = skyPanel ? skyPanel.feasible === true : plan.feasible;
    const noPeriod = this.noPeriod();
    if (noPeriod) {
      // The visits and hours follow from a period the relation cannot give: they are not stated.
      return {
        tone: 'infeasible' as const,
        title: `Not feasible on ${node.code}`,
        detail: `No expected period. ${noExpectedPeriodReason(noPeriod)}`,
        reason: 'Enter its expected period in the Period field under Star.',
        sky: null,
      };
    }
    const blocking = plan.flags.find((flag) => flag.severity === 'blocking');
    const reason = blocking ? sentence(blocking.message) : skyPanel && !skyPanel.feasible ? sentence(`Sky window: ${skyPanel.reasons[0] ?? 'the cadence does not fit'}`) : null;
    const fee = formatMinorCurrency(q.feeMinor.value, plan.currency, this.locale);
    const completeness = q.completeness ? ` for ${formatPercent(q.completeness.value, this.locale)} completeness` : '';
    return {
      tone: feasible ? ('feasible' as const) : ('infeasible' as const),
      title: feasible ? `Feasible on ${node.code}` : `Not feasible on ${node.code}`,
      detail:
        `Expected period ${f(q.periodDays.value)} d (plausible ${f(q.shortestPeriodDays.value)}–${f(q.longestPeriodDays.value)} d); ` +
        `${formatValue(q.visits.value, this.locale, { integer: true })} visits over ${formatValue(q.baselineDays.value, this.locale, { integer: true })} d${completeness}; ` +
        `${f(q.nodeHours.value)} node-hours, ${fee}.`,
      reason,
      sky: skyPanel
        ? `Sky window from ${node.site.name}: ${skyPanel.assessment?.fits ? 'the cadence fits' : 'the cadence does not fit'}.`
        : this.skyStatusLine(),
    };
  });

  constructor() {
    // Choose the first node and the first open (else upcoming) cycle once they arrive.
    effect(() => {
      const nodes = this.activeNodes();
      const control = this.form.controls.nodeId;
      if (nodes.length && !nodes.some((node) => node.id === control.value)) control.setValue(nodes[0].id);
    });
    effect(() => {
      const cycles = this.cycleOptions();
      const control = this.form.controls.cycleId;
      if (control.value === null && !control.dirty && cycles.length && cycles[0].status !== 'closed') control.setValue(cycles[0].id);
    });

    const destroyRef = inject(DestroyRef);
    // Switching B−V ↔ BP−RP converts the typed colour through the dwarf sequence.
    this.form.controls.colourSystem.valueChanges
      .pipe(startWith(this.form.controls.colourSystem.value), pairwise(), takeUntilDestroyed(destroyRef))
      .subscribe(([from, to]) => this.convertColour(from, to));
    // The star-type helper fills the colour in the chosen system (reddened by E(B−V) if given);
    // typing another colour clears the helper, which no longer describes it.
    this.starType.valueChanges.pipe(takeUntilDestroyed(destroyRef)).subscribe((type) => this.fillColourFromType(type));
    this.form.controls.colourValue.valueChanges.pipe(takeUntilDestroyed(destroyRef)).subscribe((value) => {
      if (this.starType.value !== null && value !== this.filledColour) this.starType.setValue(null, { emitEvent: false });
    });
  }

  /** The colour the star-type helper last wrote. */
  private filledColour: number | null = null;

  private createMatchers(): Record<PlannerField, ErrorStateMatcher> {
    const matchers = {} as Record<PlannerField, ErrorStateMatcher>;
    for (const field of Object.keys(FIELD_LABELS) as PlannerField[]) {
      matchers[field] = { isErrorState: () => !!this.fieldErrors()[field] };
    }
    return matchers;
  }

  private skyStatusLine(): string {
    switch (this.sky().kind) {
      case 'loading':
        return 'Checking the sky window…';
      case 'error':
        return 'The sky window could not be computed.';
      default:
        return 'Sky window not checked: give RA/Dec and a cycle.';
    }
  }

  protected error(field: PlannerField): string {
    return this.fieldErrors()[field] ?? '';
  }

  protected isCompared(nodeId: number): boolean {
    return this.live().compareNodeIds.includes(nodeId);
  }

  protected toggleCompare(nodeId: number, checked: boolean): void {
    const control = this.form.controls.compareNodeIds;
    const rest = control.value.filter((id) => id !== nodeId);
    control.setValue(checked ? [...rest, nodeId] : rest);
  }

  protected retrySky(): void {
    this.skyAttempt.update((n) => n + 1);
  }

  protected cycleLabel(cycle: CycleSummary): string {
    return `${cycle.code} — ${cycle.title} (campaign ${cycle.campaignStart} to ${cycle.campaignEnd}; call ${cycle.status})`;
  }

  protected nodeLabel(node: TelescopeNode): string {
    return `${node.code} — ${node.name}, ${node.site.name}`;
  }

  private convertColour(from: TargetColourSystem, to: TargetColourSystem): void {
    const control = this.form.controls.colourValue;
    if (from === to || control.value === null) return;
    if (this.starType.value !== null) {
      this.fillColourFromType(this.starType.value);
      return;
    }
    const ebv = this.form.controls.reddeningEbv.value ?? 0;
    try {
      const intrinsic = deredden({ value: control.value, system: from }, ebv);
      const converted = dwarfSequenceAt(from, intrinsic.value)[to === 'BV' ? 'bvMag' : 'bpRpMag'];
      control.setValue(round3(redden({ value: converted, system: to }, ebv).value));
    } catch {
      // Outside the dwarf sequence: keep the number; the plan will say what is wrong with it.
    }
  }

  private fillColourFromType(type: string | null): void {
    const row = DWARF_SEQUENCE.find((r) => r.spectralType === type);
    if (!row) return;
    const system = this.form.controls.colourSystem.value;
    const ebv = this.form.controls.reddeningEbv.value ?? 0;
    const intrinsic = system === 'BV' ? row.bvMag : row.bpRpMag;
    try {
      this.filledColour = round3(redden({ value: intrinsic, system }, ebv).value);
    } catch {
      this.filledColour = intrinsic;
    }
    this.form.controls.colourValue.setValue(this.filledColour);
  }
}

function round3(value: number): number {
  return Math.round(value * 1000) / 1000;
}

/** "Age: Must be positive (got -5)." for one field; the labels listed for several. */
function describeErrors(errors: FieldErrors): string {
  const entries = Object.entries(errors) as [PlannerField, string][];
  if (entries.length === 1) return `${FIELD_LABELS[entries[0][0]]}: ${entries[0][1]}`;
  return `Check ${entries.map(([field]) => FIELD_LABELS[field]).join(', ')}.`;
}
