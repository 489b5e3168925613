import type { HttpErrorResponse } from '@angular/common/http';
import { computed, DestroyRef, effect, inject, Injectable, LOCALE_ID, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl } from '@angular/forms';
import type { CycleSummary, TelescopeNode } from '@spincycle/shared/facility/facility-types';
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
import { GYRO_RELATION_INFO } from '@spincycle/shared/science/gyrochronology';
import { isScienceInputError } from '@spincycle/shared/science/science-input-error';
import {
  computeTargetPlan,
  defaultRelationFor,
  type TargetPlan,
  type TargetPlanOptions,
  type TargetPlanTarget,
} from '@spincycle/shared/science/target-plan';
import type { CadenceAssessment } from '@spincycle/shared/sky/cadence-assessment';
import { SkyInputError } from '@spincycle/shared/sky/sky-input-error';
import type { NightDarkReport, TargetWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import { catchError, debounceTime, distinctUntilChanged, map, of, pairwise, startWith, switchMap, type Observable } from 'rxjs';
import { loadErrorText, readApiError } from '../../core/http/api-error-message';
import { gyrochroneSeries, periodColourSeries, type StarMarker } from './gyro-curves';
import { formatValue, noExpectedPeriodFlag } from './plan-display';
import { buildPlanSummary, invalidSummary, type PlanSummary, SUMMARY_WARNING_FLAGS, uniqueSentences } from './plan-summary';
import { plainFlag } from '../../ui/text/plan-wording';
import {
  controlForScienceField,
  controlForSkyField,
  createPlannerForm,
  type FieldErrors,
  type PlannerField,
  type PlannerValue,
  RECOMPUTE_DEBOUNCE_MS,
  sentence,
  toPlanInput,
} from './planner-form';
import { PlannerApi } from './planner-api';
import {
  between,
  colourSystemWarning,
  observedColourRange,
  rangeNumber,
  scienceErrorMessage,
  validatePlannerValue,
  validateRaDec,
} from './planner-validation';
import { SkyWindowsApi } from './sky-windows-api';

/** The plan of the form's current value, or why there is none. */
export type PlanState =
  | { kind: 'waiting' }
  | { kind: 'invalid'; fieldErrors: FieldErrors; message: string }
  | { kind: 'ok'; plan: TargetPlan; node: TelescopeNode; target: TargetPlanTarget; options: TargetPlanOptions };

/** Whether the sky windows can be asked for. */
type SkyInput =
  { kind: 'off'; hint: string } | { kind: 'invalid'; fieldErrors: FieldErrors } | { kind: 'ready'; request: SkyWindowsRequest };

export type SkyState =
  | { kind: 'idle' }
  | { kind: 'loading'; nodeCount: number }
  | { kind: 'error'; error: ApiErrorBody }
  | { kind: 'done'; response: SkyWindowsResponse };

/** One node's plan against its sky windows, or why there is none. */
type NodePlanState = { kind: 'ok'; combined: NodeTargetPlan } | { kind: 'error'; note: string };

/** One node's sky-window chart with the plan's verdict on it. */
export interface SkyPanel {
  nodeId: number;
  heading: string;
  /** The plan's own node (its verdict, reasons and ways out are in the summary). */
  planNode: boolean;
  target: TargetWindowsReport;
  nights: NightDarkReport[];
  assessment: CadenceAssessment | null;
  feasible: boolean | null;
  reasons: string[];
  suggestions: PlanSuggestion[];
  note: string | null;
}

/** Field names as the page says them (in messages that list several fields). */
export const FIELD_LABELS: Readonly<Record<PlannerField, string>> = {
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

/** The order of the fields on the page (messages list them in it). */
const FIELD_ORDER = Object.keys(FIELD_LABELS) as PlannerField[];

const STATUS_ORDER: Readonly<Record<CycleSummary['status'], number>> = { open: 0, upcoming: 1, closed: 2 };

/** "Age: Enter an age above 0 Myr." for one field; the labels listed for several. */
export function describeErrors(errors: FieldErrors): string {
  const fields = FIELD_ORDER.filter((field) => errors[field]);
  if (fields.length === 1) return `${FIELD_LABELS[fields[0]]}: ${errors[fields[0]]}`;
  const labels = [...new Set(fields.map((field) => FIELD_LABELS[field]))];
  return `Fix the ${labels.length} fields marked in red: ${labels.join(', ')}.`;
}

/**
 * The target planner's state: the form, the nodes and cycles, the plan recomputed in the
 * browser as the inputs settle, its summary, the gyrochronology chart series and the sky windows
 * of the chosen nodes. Provided by the planner page; its child components read it.
 */
@Injectable()
export class PlannerStore {
  private readonly api = inject(PlannerApi);
  private readonly skyApi = inject(SkyWindowsApi);
  private readonly locale = inject(LOCALE_ID);

  readonly nodes = this.api.nodesResource();
  readonly cycles = this.api.cyclesResource();

  readonly form = createPlannerForm();
  /** The "pick a star type" helper: fills the colour, not part of the plan's input. */
  readonly starType = new FormControl<string | null>(null);

  private readonly value$: Observable<PlannerValue> = this.form.valueChanges.pipe(map(() => this.form.getRawValue()));
  /** The form's value as typed (for hints and toggles). */
  readonly live = toSignal(this.value$, { initialValue: this.form.getRawValue() });
  /** The form's value once typing pauses: what the plan and the sky windows follow. */
  private readonly settled = toSignal(this.value$.pipe(debounceTime(RECOMPUTE_DEBOUNCE_MS)), { initialValue: this.form.getRawValue() });

  // ---- nodes and cycles ------------------------------------------------------------------

  readonly activeNodes = computed(() =>
    (this.nodes.hasValue() ? this.nodes.value() : [])
      .filter((node) => node.active && node.site)
      .sort((a, b) => a.code.localeCompare(b.code)),
  );
  private readonly nodeById = computed(() => new Map(this.activeNodes().map((node) => [node.id, node])));
  readonly selectedNode = computed(() => this.nodeById().get(this.live().nodeId ?? -1) ?? null);
  readonly nodesError = computed(() => loadErrorText(this.nodes.error(), 'The nodes could not be loaded.'));
  readonly nodesEmpty = computed(() => this.nodes.hasValue() && this.activeNodes().length === 0);
  readonly loading = computed(() => this.nodes.isLoading() || this.cycles.isLoading());

  readonly cycleOptions = computed(() =>
    (this.cycles.hasValue() ? this.cycles.value() : [])
      .slice()
      .sort((a, b) => STATUS_ORDER[a.status] - STATUS_ORDER[b.status] || a.campaignStart.localeCompare(b.campaignStart)),
  );
  readonly cyclesError = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));

  // ---- hints ---------------------------------------------------------------------------------

  readonly colourName = computed(() => colourLabel(this.live().colourSystem));
  readonly colourRangeHint = computed(() => {
    const v = this.live();
    const ebv = v.reddeningEbv !== null && v.reddeningEbv > 0 && v.reddeningEbv <= 3 ? v.reddeningEbv : 0;
    const r = observedColourRange(v.colourSystem, ebv);
    return `${between(r.min, r.max, 'mag')} (F5–M5 dwarfs${ebv ? `, with E(B−V) = ${rangeNumber(ebv)}` : ''})`;
  });
  /** A warning next to the colour system when the typed colour belongs to the other system. */
  readonly colourWarning = computed(() => colourSystemWarning(this.live()));
  /** The nearest dwarf type of the typed colour (after E(B−V)), or null outside the table. */
  readonly nearestType = computed(() => {
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
  readonly defaultRelationLabel = computed(() => GYRO_RELATION_INFO[defaultRelationFor(this.live().colourSystem)].label);
  readonly exposureHint = computed(() => {
    const node = this.selectedNode();
    return node ? `${between(node.minExposureSeconds, node.maxExposureSeconds, 's')} on ${node.code}` : 'Within the node’s range';
  });

  // ---- the plan ------------------------------------------------------------------------------

  readonly planState = computed<PlanState>(() => {
    const value = this.settled();
    const node = this.nodeById().get(value.nodeId ?? -1);
    if (!node) return { kind: 'waiting' };
    // Every bad field at once, in the user's own numbers (the core would stop at the first).
    const errors = validatePlannerValue(value, node);
    if (Object.keys(errors).length) return { kind: 'invalid', fieldErrors: errors, message: describeErrors(errors) };
    const { target, options } = toPlanInput(value);
    try {
      return { kind: 'ok', plan: computeTargetPlan(target, node, node.site, options), node, target, options };
    } catch (error) {
      if (!isScienceInputError(error)) throw error;
      const field = controlForScienceField(error.field);
      const fieldErrors: FieldErrors = field ? { [field]: scienceErrorMessage(error.reason) } : {};
      return { kind: 'invalid', fieldErrors, message: field ? describeErrors(fieldErrors) : scienceErrorMessage(error.message) };
    }
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
        plans.set(node.id, { kind: 'error', note: `No plan on this node with these inputs: ${scienceErrorMessage(error.message)}` });
      }
    }
    return plans;
  });

  /** The plan against the chosen node's sky windows, once they are loaded. */
  readonly combined = computed<NodeTargetPlan | null>(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    const onSky = this.nodePlans().get(state.node.id);
    return onSky?.kind === 'ok' ? onSky.combined : null;
  });

  /**
   * The plan the results show. Once the sky windows of the chosen node are loaded, it is the
   * proposal's plan (`computeNodeTargetPlan`: the moonlit sky of the usable nights, a baseline
   * lengthened for day-locked periods); until then, the plan under the site's dark sky.
   */
  readonly plan = computed(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    return this.combined()?.plan ?? state.plan;
  });

  /** The node of the plan shown. */
  readonly planNode = computed(() => {
    const state = this.planState();
    return state.kind === 'ok' ? state.node : null;
  });

  /** The blocking "no expected period" flag of the plan: the proposer must give the period. */
  readonly noPeriod = computed(() => {
    const plan = this.plan();
    return plan ? noExpectedPeriodFlag(plan) : null;
  });
  /** The period fields are offered when the plan needs them, and stay while they hold a value. */
  readonly showPeriodFields = computed(() => {
    const v = this.live();
    return (
      this.noPeriod() !== null ||
      v.periodDays !== null ||
      v.periodUncertaintyDays !== null ||
      !!this.fieldErrors().periodDays ||
      !!this.fieldErrors().periodUncertaintyDays
    );
  });

  /** The plan's notices that are not reasons it fails (those are in the summary), in plain words. */
  readonly notices = computed<ScienceFlag[]>(() => {
    const order = { blocking: 0, caution: 1, info: 2 } as const;
    const seen = new Set<string>();
    return (this.plan()?.flags ?? [])
      .filter((flag) => flag.severity !== 'blocking' && !SUMMARY_WARNING_FLAGS.has(flag.code))
      .map(plainFlag)
      .filter((flag) => (seen.has(flag.message) ? false : (seen.add(flag.message), true)))
      .sort((a, b) => order[a.severity] - order[b.severity]);
  });

  /** The summary block: the decision numbers, the verdict, the reasons and the ways out. */
  readonly summary = computed<PlanSummary | null>(() => {
    const state = this.planState();
    if (state.kind === 'waiting') return null;
    // Every field in trouble is listed, the sky-window fields included.
    if (state.kind === 'invalid')
      return invalidSummary(
        Object.keys(state.fieldErrors).length ? describeErrors({ ...this.fieldErrors(), ...state.fieldErrors }) : state.message,
      );
    return buildPlanSummary({
      plan: this.plan() ?? state.plan,
      node: state.node,
      combined: this.combined(),
      skyStatus: this.skyStatusLine(),
      locale: this.locale,
    });
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

  readonly gyrochrone = computed(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    return gyrochroneSeries({
      colour: state.target.colour,
      reddeningEbvMag: state.target.reddeningEbvMag,
      relation: state.plan.relation,
      star: this.star(),
    });
  });

  readonly periodColour = computed(() => {
    const state = this.planState();
    if (state.kind !== 'ok') return null;
    return periodColourSeries({
      system: state.target.colour.system,
      ageMyr: state.target.ageMyr,
      relation: state.plan.relation,
      star: this.star(),
    });
  });

  // ---- sky windows ---------------------------------------------------------------------------

  private readonly skyInput = computed<SkyInput>(() => {
    const v = this.settled();
    const ra = v.ra.trim();
    const dec = v.dec.trim();
    if (!ra && !dec) return { kind: 'off', hint: 'Give the right ascension and declination to see the sky window from the node.' };
    const errors = validateRaDec(ra, dec);
    if (Object.keys(errors).length) return { kind: 'invalid', fieldErrors: errors };
    if (v.cycleId === null) return { kind: 'off', hint: 'Choose a cycle to see the sky window over its campaign.' };
    const unique = [...new Set([v.nodeId, ...v.compareNodeIds].filter((id): id is number => id !== null && this.nodeById().has(id)))];
    if (!unique.length) return { kind: 'off', hint: 'Choose a node.' };
    // The star's name is left out: the chart does not need it, and renaming must not ask again.
    return { kind: 'ready', request: { cycleId: v.cycleId, nodeIds: unique, targets: [{ ra, dec }], includeNights: true } };
  });

  readonly skyHint = computed(() => {
    const input = this.skyInput();
    if (input.kind === 'invalid') return 'Correct the position marked in red to see the sky window.';
    return input.kind === 'off' ? input.hint : null;
  });

  /** Bumped by "Try again" so that the same request is sent once more. */
  private readonly skyAttempt = signal(0);

  private readonly skyRequest = computed(() => {
    const input = this.skyInput();
    return input.kind === 'ready' ? { request: input.request, attempt: this.skyAttempt() } : null;
  });

  readonly sky = toSignal(
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

  readonly skyError = computed(() => {
    const state = this.sky();
    if (state.kind !== 'error') return null;
    const onFields = Object.keys(state.error.fieldErrors ?? {}).some((key) => controlForSkyField(key) !== null);
    return onFields
      ? 'The sky window could not be computed: see the fields marked in red.'
      : `The sky window could not be computed. ${state.error.message}`;
  });

  readonly skyPanels = computed<SkyPanel[]>(() => {
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
        planNode: planState.kind === 'ok' && planState.node.id === entry.nodeId,
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
        panel.reasons = uniqueSentences(onSky.combined.reasons);
        const seen = new Set<string>();
        panel.suggestions = onSky.combined.suggestions.filter((s) => (seen.has(s.message) ? false : (seen.add(s.message), true)));
      } else if (onSky?.kind === 'error') {
        panel.note = onSky.note;
      } else if (planState.kind !== 'ok') {
        panel.note = 'The verdict needs a valid plan: fix the inputs marked in red.';
      }
      panels.push(panel);
    }
    return panels;
  });

  // ---- errors under the fields ----------------------------------------------------------------

  readonly fieldErrors = computed<FieldErrors>(() => {
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

  /** Where the sky window stands while it is not loaded for the plan's node. */
  private skyStatusLine(): string {
    switch (this.sky().kind) {
      case 'loading':
        return 'Checking the sky window…';
      case 'error':
        return 'The sky window could not be computed.';
      default:
        return this.skyInput().kind === 'ready'
          ? 'Sky window not checked yet.'
          : 'Sky window not checked yet: give the position and a cycle under Sky window.';
    }
  }

  isCompared(nodeId: number): boolean {
    return this.live().compareNodeIds.includes(nodeId);
  }

  toggleCompare(nodeId: number, checked: boolean): void {
    const control = this.form.controls.compareNodeIds;
    const rest = control.value.filter((id) => id !== nodeId);
    control.setValue(checked ? [...rest, nodeId] : rest);
  }

  retrySky(): void {
    this.skyAttempt.update((n) => n + 1);
  }

  reloadNodes(): void {
    this.nodes.reload();
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
      // Outside the dwarf sequence: keep the number; the field says what is wrong with it.
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
