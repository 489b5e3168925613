import { z } from 'zod';

const isoInstant = z.iso.datetime({ offset: true, message: 'use an ISO 8601 instant, e.g. 2027-01-15T23:59:59Z' });
const localDate = z.iso.date({ message: 'use a date YYYY-MM-DD' });

/**
 * What the submit checklist does with a proposal that asks more node-hours on a node than the
 * cycle offers there: `warn` lets it through with a warning (the panel weighs it), `block`
 * stops submission until the request fits.
 */
export const CAPACITY_OVERRUN_RULES = ['warn', 'block'] as const;
export type CapacityOverrunRule = (typeof CAPACITY_OVERRUN_RULES)[number];
export const DEFAULT_CAPACITY_OVERRUN: CapacityOverrunRule = 'warn';

/** `2027-01-16T00:00:00Z` → `16 Jan 2027, 00:00 UTC` (the one way instants are written in messages about cycles). */
export function formatUtcInstant(iso: string): string {
  const d = new Date(iso);
  const month = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'][d.getUTCMonth()];
  return `${d.getUTCDate()} ${month} ${d.getUTCFullYear()}, ${d.toISOString().slice(11, 16)} UTC`;
}

/**
 * The first night the campaign may start on: the campaign's nights are local dates at the
 * sites, and the evening of date D is later than D 00:00 UTC everywhere on Earth, so a first
 * night on or after the UTC date following the closing instant (or on the closing date itself
 * when the call closes at 00:00 UTC) never starts before the call has closed.
 */
export function earliestCampaignStart(callClosesAt: string): string {
  const t = Date.parse(callClosesAt);
  const day = Math.ceil(t / 86400_000) * 86400_000;
  return new Date(day).toISOString().slice(0, 10);
}

/** POST /api/cycles and PUT /api/cycles/:id (facility managers). Instants are stored in UTC. */
export const cycleInputSchema = z
  .object({
    code: z
      .string()
      .trim()
      .min(1, { message: 'give the cycle a short code' })
      .max(20)
      .regex(/^[A-Za-z0-9._-]+$/, { message: 'letters, digits, dot, dash or underscore' }),
    title: z.string().trim().min(1, { message: 'give the cycle a title' }).max(200),
    callOpensAt: isoInstant,
    callClosesAt: isoInstant,
    campaignStart: localDate,
    campaignEnd: localDate,
    anonymousReview: z.boolean(),
    /** Submitting a proposal that asks a node for more than its capacity: warn (default) or block. */
    capacityOverrun: z.enum(CAPACITY_OVERRUN_RULES, { message: 'choose warn or block' }).default(DEFAULT_CAPACITY_OVERRUN),
    categories: z.array(z.string().trim().min(1).max(80)).min(1, { message: 'list at least one science category' }).max(20),
    nodes: z
      .array(z.object({ nodeId: z.number().int().positive(), nodeHoursAvailable: z.number().min(0).max(100_000) }))
      .min(1, { message: 'at least one node takes part' })
      .max(50),
  })
  .superRefine((c, ctx) => {
    if (Date.parse(c.callClosesAt) <= Date.parse(c.callOpensAt))
      ctx.addIssue({ code: 'custom', path: ['callClosesAt'], message: 'the call must close after it opens' });
    if (!Number.isNaN(Date.parse(c.callClosesAt)) && c.campaignStart < earliestCampaignStart(c.callClosesAt)) {
      ctx.addIssue({
        code: 'custom',
        path: ['campaignStart'],
        message: `the campaign cannot start before the call closes (${formatUtcInstant(c.callClosesAt)}): first night ${earliestCampaignStart(c.callClosesAt)} or later`,
      });
    }
    if (c.campaignEnd < c.campaignStart)
      ctx.addIssue({ code: 'custom', path: ['campaignEnd'], message: 'the campaign must end on or after its first night' });
    const days = (Date.parse(c.campaignEnd) - Date.parse(c.campaignStart)) / 86400_000 + 1;
    if (days > 366) ctx.addIssue({ code: 'custom', path: ['campaignEnd'], message: 'a campaign lasts at most 366 nights' });
    const seen = new Set<number>();
    c.nodes.forEach((n, i) => {
      if (seen.has(n.nodeId)) ctx.addIssue({ code: 'custom', path: ['nodes', i, 'nodeId'], message: 'this node is listed twice' });
      seen.add(n.nodeId);
    });
  });
export type CycleInput = z.infer<typeof cycleInputSchema>;

/**
 * PUT carries the version read, so that two managers do not overwrite each other.
 * `confirmCapacityCut`: the manager has seen that the new capacity of some node is below what
 * the cycle's submitted proposals request there, and saves anyway (without it → 409
 * `capacity_below_requests`).
 */
export const cycleUpdateSchema = z.object({
  version: z.number().int().positive(),
  cycle: cycleInputSchema,
  confirmCapacityCut: z.boolean().optional(),
});
export type CycleUpdate = z.infer<typeof cycleUpdateSchema>;
