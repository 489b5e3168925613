import { z } from 'zod';

const isoInstant = z.iso.datetime({ offset: true, message: 'use an ISO 8601 instant, e.g. 2027-01-15T23:59:59Z' });
const localDate = z.iso.date({ message: 'use a date YYYY-MM-DD' });

/** POST /api/cycles and PUT /api/cycles/:id (facility managers). Instants are stored in UTC. */
export const cycleInputSchema = z
  .object({
    code: z.string().trim().min(1, { message: 'give the cycle a short code' }).max(20).regex(/^[A-Za-z0-9._-]+$/, { message: 'letters, digits, dot, dash or underscore' }),
    title: z.string().trim().min(1, { message: 'give the cycle a title' }).max(200),
    callOpensAt: isoInstant,
    callClosesAt: isoInstant,
    campaignStart: localDate,
    campaignEnd: localDate,
    anonymousReview: z.boolean(),
    categories: z.array(z.string().trim().min(1).max(80)).min(1, { message: 'list at least one science category' }).max(20),
    nodes: z
      .array(z.object({ nodeId: z.number().int().positive(), nodeHoursAvailable: z.number().min(0).max(100_000) }))
      .min(1, { message: 'at least one node takes part' })
      .max(50),
  })
  .superRefine((c, ctx) => {
    if (Date.parse(c.callClosesAt) <= Date.parse(c.callOpensAt)) ctx.addIssue({ code: 'custom', path: ['callClosesAt'], message: 'the call must close after it opens' });
    if (c.campaignEnd < c.campaignStart) ctx.addIssue({ code: 'custom', path: ['campaignEnd'], message: 'the campaign must end on or after its first night' });
    const days = (Date.parse(c.campaignEnd) - Date.parse(c.campaignStart)) / 86400_000 + 1;
    if (days > 366) ctx.addIssue({ code: 'custom', path: ['campaignEnd'], message: 'a campaign lasts at most 366 nights' });
    const seen = new Set<number>();
    c.nodes.forEach((n, i) => {
      if (seen.has(n.nodeId)) ctx.addIssue({ code: 'custom', path: ['nodes', i, 'nodeId'], message: 'this node is listed twice' });
      seen.add(n.nodeId);
    });
  });
export type CycleInput = z.infer<typeof cycleInputSchema>;

/** PUT carries the version read, so that two managers do not overwrite each other. */
export const cycleUpdateSchema = z.object({ version: z.number().int().positive(), cycle: cycleInputSchema });
export type CycleUpdate = z.infer<typeof cycleUpdateSchema>;
