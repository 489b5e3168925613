import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import { computePressure, darkHoursByRaBin, type CyclePressureReport } from '@spincycle/shared/review/pressure';
import type { SkyCampaign, SkySite } from '@spincycle/shared/sky/sky-types';
import type { AppContext } from '../../../app-context';
import { AppError } from '../../../http/app-error';
import { listCycleNodes } from '../../cycles/cycle-repository';
import { listNodes } from '../../facility/facility-repository';
import { chairsPanelOfCycle, findCycleForPressure, listPressureRequests } from './standing-repository';
import { isPanelStage } from './standing-service';

/** Most dark-hour tables kept by the web process. */
const DARK_HOURS_CACHE_SIZE = 200;
const darkHoursCache = new Map<string, number[]>();

/**
 * `darkHoursByRaBin`, kept by its inputs: it is a pure function of the site, the altitude limit
 * and the campaign (about half a second for a 60-night campaign), and nodes at one site with one
 * limit share it. Oldest entries leave first.
 */
function cachedDarkHours(site: SkySite, altitudeLimitDeg: number, campaign: SkyCampaign): number[] {
  const key = JSON.stringify([site.latitudeDeg, site.longitudeDeg, site.elevationM, site.timeZone, altitudeLimitDeg, campaign]);
  let hours = darkHoursCache.get(key);
  if (!hours) {
    hours = darkHoursByRaBin(site, altitudeLimitDeg, campaign);
    if (darkHoursCache.size >= DARK_HOURS_CACHE_SIZE) darkHoursCache.delete(darkHoursCache.keys().next().value!);
    darkHoursCache.set(key, hours);
  }
  return hours;
}

/**
 * GET /api/review/cycles/:cycleId/pressure: facility managers; the chair of a panel of the cycle
 * (reviewer role) once the review deadline has passed. Others 403 (a missing cycle is a 404
 * only for managers). Only totals: no proposal, team or target is named.
 */
export async function getCyclePressure(ctx: AppContext, viewer: SessionUser, cycleId: number): Promise<CyclePressureReport> {
  const cycle = await findCycleForPressure(ctx.db, cycleId);
  const manager = hasAnyRole(viewer, 'facility_manager');
  const forbidden = () => new AppError('forbidden', "Only a facility manager or a panel's chair can see the cycle's pressure", 403);
  if (!cycle) throw manager ? new AppError('cycle_not_found', `No cycle ${cycleId}`, 404) : forbidden();
  if (!manager) {
    const chair = hasAnyRole(viewer, 'reviewer') && (await chairsPanelOfCycle(ctx.db, cycleId, viewer.id));
    if (!chair) throw forbidden();
    if (!isPanelStage(cycle.review_deadline, ctx.now())) {
      throw new AppError('not_panel_stage', "The cycle's pressure opens to panel chairs once the review deadline has passed", 403);
    }
  }
  const capacity = await listCycleNodes(ctx.db, cycleId);
  const nodes = await listNodes(
    ctx.db,
    capacity.map((c) => c.nodeId),
  );
  const campaign = { firstNight: cycle.campaign_start, lastNight: cycle.campaign_end };
  const darkHoursByNode = new Map<number, number[]>();
  for (const node of nodes) darkHoursByNode.set(node.id, cachedDarkHours(node.site, node.altitudeLimitDeg, campaign));
  const { requests, proposalCount } = await listPressureRequests(ctx.db, cycleId);
  const totals = computePressure(capacity, requests, darkHoursByNode);
  return {
    cycleId,
    cycleCode: cycle.code,
    campaignStart: cycle.campaign_start,
    campaignEnd: cycle.campaign_end,
    proposalCount,
    ...totals,
  };
}
