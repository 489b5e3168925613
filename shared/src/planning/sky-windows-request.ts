import { z } from 'zod';
import { idSchema } from '../http/ids';
import { safeText } from '../http/text';
import type { SkyWindowsReport } from '../sky/sky-windows-report';

/** Most targets one sky-windows request may carry (the client sends longer lists in chunks). */
export const SKY_WINDOWS_MAX_TARGETS = 500;

/** Most targets per request when per-night detail is asked for (it is ~36 kB per target and node). */
export const SKY_WINDOWS_MAX_TARGETS_WITH_NIGHTS = 50;

/**
 * The work of a request in target-node-nights (targets × nodes × nights of the campaign): the
 * windows are computed per target, per night, from each node's site.
 */
export function skyWindowsCost(targets: number, nodes: number, nights: number): number {
  return targets * nodes * nights;
}

/**
 * Largest request computed on the web process's request thread (≈ 50 targets on one node over
 * a 40-night campaign, a few milliseconds): anything larger is computed on a worker thread, so
 * that the web process keeps answering other requests meanwhile.
 */
export const SKY_WINDOWS_MAX_INLINE_COST = 2_000;

/**
 * Largest request accepted at all: a full list (500 targets) on two nodes over the longest
 * campaign (366 nights). Larger requests get 400 with their numbers; split them by node.
 */
export const SKY_WINDOWS_MAX_COST = SKY_WINDOWS_MAX_TARGETS * 2 * 366;

/** One row of a sky-windows request: RA/Dec as typed (degrees, `12.5h`, sexagesimal). */
export const skyWindowsTargetSchema = z.object({
  name: safeText(z.string().trim().max(80)).optional(),
  ra: z.union([z.number(), safeText(z.string().trim().min(1, { message: 'is empty' }).max(40))]),
  dec: z.union([z.number(), safeText(z.string().trim().min(1, { message: 'is empty' }).max(40))]),
});

/** POST /api/sky-windows */
export const skyWindowsRequestSchema = z
  .object({
    cycleId: idSchema,
    nodeIds: z.array(idSchema).min(1, { message: 'choose at least one node' }).max(10),
    targets: z
      .array(skyWindowsTargetSchema)
      .min(1, { message: 'give at least one target' })
      .max(SKY_WINDOWS_MAX_TARGETS, {
        message: `at most ${SKY_WINDOWS_MAX_TARGETS} targets per request`,
      }),
    /** Per-night detail for charts (default true); false returns only the summaries. */
    includeNights: z.boolean().default(true),
  })
  .refine((r) => !r.includeNights || r.targets.length <= SKY_WINDOWS_MAX_TARGETS_WITH_NIGHTS, {
    path: ['includeNights'],
    message: `per-night detail is limited to ${SKY_WINDOWS_MAX_TARGETS_WITH_NIGHTS} targets per request: ask for summaries, or send fewer targets`,
  });
export type SkyWindowsRequest = z.input<typeof skyWindowsRequestSchema>;

/** The windows of the targets from one node's site, with that node's own limits. */
export interface NodeSkyWindows {
  nodeId: number;
  nodeCode: string;
  nodeName: string;
  siteName: string;
  weatherLossFraction: number;
  report: SkyWindowsReport;
}

export interface SkyWindowsResponse {
  cycle: { id: number; code: string; campaignStart: string; campaignEnd: string };
  nodes: NodeSkyWindows[];
}
