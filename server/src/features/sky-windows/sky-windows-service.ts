import type { SkyWindowsResponse } from '@spincycle/shared/planning/sky-windows-request';
import type { skyWindowsRequestSchema } from '@spincycle/shared/planning/sky-windows-request';
import { computeSkyWindows, parseRaDec, SkyInputError, skyLimitsForNode, toSkyWindowsReport } from '@spincycle/shared/sky/index';
import type { z } from 'zod';
import type { AppContext } from '../../app-context';
import { AppError, invalidField } from '../../http/app-error';
import { findCycleById } from '../cycles/cycle-repository';
import { listNodes } from '../facility/facility-repository';

type Input = z.output<typeof skyWindowsRequestSchema>;

/** `targets[3].decDeg` (science core) → `targets.3.dec` (API field path). */
function apiField(field: string): string {
  return field.replace(/\[(\d+)\]/g, '.$1').replace(/\.(ra|dec)Deg$/, '.$1');
}

/**
 * Sky windows of a list of targets from the sites of the chosen nodes over a cycle's
 * campaign, each node with its own altitude and Sun limits. Every bad coordinate is reported
 * at once, by row (1-based, as people count rows).
 */
export async function computeCycleSkyWindows(ctx: AppContext, input: Input): Promise<SkyWindowsResponse> {
  const cycle = await findCycleById(ctx.db, input.cycleId);
  if (!cycle) throw invalidField('cycleId', `no cycle ${input.cycleId}`);
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
    throw new AppError('validation_failed', fieldErrors[keys[0]][0] + (keys.length > 1 ? ` (and ${keys.length - 1} more)` : ''), 400, fieldErrors);
  }
  const valid = targets as { name: string | null; raDeg: number; decDeg: number }[];

  return {
    cycle: { id: cycle.id, code: cycle.code, campaignStart: cycle.campaignStart, campaignEnd: cycle.campaignEnd },
    nodes: nodes.map((node) => {
      const result = computeSkyWindows({
        site: node.site,
        limits: skyLimitsForNode(node),
        campaign: { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd },
        targets: valid.map((t) => ({ name: t.name ?? undefined, raDeg: t.raDeg, decDeg: t.decDeg })),
      });
      return {
        nodeId: node.id,
        nodeCode: node.code,
        nodeName: node.name,
        siteName: node.site.name,
        weatherLossFraction: node.weatherLossFraction,
        report: toSkyWindowsReport(result, { includeNights: input.includeNights }),
      };
    }),
  };
}

