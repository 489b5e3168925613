import {
  computeSkyWindows,
  toSkyWindowsReport,
  type SkyCampaign,
  type SkyLimits,
  type SkySite,
  type SkyTarget,
  type SkyWindowsReport,
} from '@spincycle/shared/sky/index';

/**
 * Everything one sky-windows request computes, as plain data: it is computed on the request
 * thread when small and otherwise sent to a worker thread (structured clone), so it carries
 * no functions or class instances.
 */
export interface SkyWindowsJob {
  campaign: SkyCampaign;
  targets: SkyTarget[];
  includeNights: boolean;
  /** One entry per node: its site and its own limits. */
  nodes: { site: SkySite; limits: SkyLimits }[];
}

/** The report of every node of the job, in the job's order (pure, no I/O). */
export function computeSkyWindowsJob(job: SkyWindowsJob): SkyWindowsReport[] {
  return job.nodes.map((node) =>
    toSkyWindowsReport(computeSkyWindows({ site: node.site, limits: node.limits, campaign: job.campaign, targets: job.targets }), {
      includeNights: job.includeNights,
    }),
  );
}
