import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import {
  SKY_WINDOWS_MAX_COST,
  SKY_WINDOWS_MAX_INLINE_COST,
  skyWindowsCost,
  type skyWindowsRequestSchema,
  type SkyWindowsResponse,
} from '@spincycle/shared/planning/sky-windows-request';
import { parseRaDec, SkyInputError, skyLimitsForNode } from '@spincycle/shared/sky/index';
import type { z } from 'zod';
import type { AppContext } from '../../app-context';
import { AppError, invalidField } from '../../http/app-error';
import { getCycleFor } from '../cycles/cycle-service';
import { listNodes } from '../facility/facility-repository';
import { computeSkyWindowsJob, type SkyWindowsJob } from './sky-windows-compute';
import { computeSkyWindowsOffThread } from './sky-windows-pool';

type Input = z.output<typeof skyWindowsRequestSchema>;

/** `targets[3].decDeg` (science core) → `targets.3.dec` (API field path). */
function apiField(field: string): string {
  return field.replace(/\[(\d+)\]/g, '.$1').replace(/\.(ra|dec)Deg$/, '.$1');
}

const fmt = (n: number) => n.toLocaleString('en-US');

/** Nights of a campaign, first and last included (local dates `YYYY-MM-DD`). */
function campaignNights(campaignStart: string, campaignEnd: string): number {
  return Math.round((Date.parse(campaignEnd) - Date.parse(campaignStart)) / 86400_000) + 1;
}

/**
 * Sky windows of a list of targets from the sites of the chosen nodes over a cycle's
 * campaign, each node with its own altitude and Sun limits. The cycle is looked up under the
 * visibility rule of GET /api/cycles/:id (a hidden or unknown cycle is the same 404). Every bad
 * coordinate is reported at once, by row (1-based, as people count rows). Small requests are
 * computed on the request thread, larger ones on a worker thread (SKY_WINDOWS_MAX_INLINE_COST),
 * and requests above SKY_WINDOWS_MAX_COST are refused with their numbers.
 */
export async function computeCycleSkyWindows(ctx: AppContext, viewer: SessionUser, input: Input): Promise<SkyWindowsResponse> {
  const cycle = await getCycleFor(ctx, viewer, input.cycleId);
  const nodes = await listNodes(ctx.db, input.nodeIds);
  const missing = input.nodeIds.filter((id) => !nodes.some((n) => n.id === id));
  if (missing.length) throw invalidField('nodeIds', `no node ${missing.join(', ')}`);

  const fieldErrors: Record<string, string[]> = {};
  const targets = input.targets.map((t, i) => {
    try {
      return { name: t.name ?? null, ...parseRaDec(t.ra, t.dec, `targets[${i}].`) };
    } catch (err) {
      if (!(err instanceof SkyInputError)) throw err;
      (fieldErrors[apiField(err.field)] ??= []).push(`row ${i + 1}, ${err.field.split('.').pop()}: ${err.reason}`);
      return null;
    }
  });
  const keys = Object.keys(fieldErrors);
  if (keys.length) {
    throw new AppError(
      'validation_failed',
      fieldErrors[keys[0]][0] + (keys.length > 1 ? ` (and ${keys.length - 1} more)` : ''),
      400,
      fieldErrors,
    );
  }
  const valid = targets as { name: string | null; raDeg: number; decDeg: number }[];

  const nights = campaignNights(cycle.campaignStart, cycle.campaignEnd);
  const cost = skyWindowsCost(valid.length, nodes.length, nights);
  if (cost > SKY_WINDOWS_MAX_COST) {
    const message =
      `The request asks for ${fmt(valid.length)} targets × ${fmt(nodes.length)} nodes × ${fmt(nights)} nights = ${fmt(cost)} target-nights; ` +
      `at most ${fmt(SKY_WINDOWS_MAX_COST)} per request: send fewer targets or nodes at a time`;
    throw new AppError('sky_windows_too_large', message, 400, { targets: [message] });
  }

  const job: SkyWindowsJob = {
    campaign: { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd },
    targets: valid.map((t) => ({ name: t.name ?? undefined, raDeg: t.raDeg, decDeg: t.decDeg })),
    includeNights: input.includeNights,
    nodes: nodes.map((node) => ({ site: node.site, limits: skyLimitsForNode(node) })),
  };
  // Why: a large request computed here would hold the event loop (seconds for a full list over
  // a long campaign), and with it every other request of the web process.
  const reports = cost <= SKY_WINDOWS_MAX_INLINE_COST ? computeSkyWindowsJob(job) : await computeSkyWindowsOffThread(job);

  return {
    cycle: { id: cycle.id, code: cycle.code, campaignStart: cycle.campaignStart, campaignEnd: cycle.campaignEnd },
    nodes: nodes.map((node, i) => ({
      nodeId: node.id,
      nodeCode: node.code,
      nodeName: node.name,
      siteName: node.site.name,
      weatherLossFraction: node.weatherLossFraction,
      report: reports[i],
    })),
  };
}
