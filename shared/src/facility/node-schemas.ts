import { z } from 'zod';

/**
 * A node's rates are PostgreSQL `integer` columns of minor units (cents for EUR, yen for JPY):
 * a larger number would fail in the database with a 500, so the schema refuses it with a 400
 * naming the field.
 */
export const MAX_RATE_MINOR_PER_HOUR = 2_147_483_647;

const rateMessage = 'must be a whole number of the currency’s smallest unit (e.g. cents), 0 or more';

/** A rate per node-hour in minor units: an integer from 0 to MAX_RATE_MINOR_PER_HOUR. */
export const rateMinorPerHourSchema = z
  .number({ message: rateMessage })
  .int({ message: rateMessage })
  .min(0, { message: rateMessage })
  .max(MAX_RATE_MINOR_PER_HOUR, { message: `must be at most ${MAX_RATE_MINOR_PER_HOUR}` });

/** The external rate's name on screen. */
export const EXTERNAL_RATE_LABEL = 'External rate per node-hour';

/** What an empty external rate means, in the words the editor shows under the field. */
export const EXTERNAL_RATE_HINT = 'Empty: external programs pay the academic rate.';

/**
 * PATCH /api/nodes/:id (facility managers): the fields of a node that can be changed here.
 * An absent field stays as it is; an unknown one is refused (naming it) rather than ignored,
 * so that nobody believes they changed something they did not.
 */
export const nodeUpdateSchema = z
  .strictObject({
    /**
     * External rate per node-hour in minor units of the node's currency (paid by programs of
     * rate class `external`); `null` clears it, and external programs then pay the academic rate.
     */
    externalRateMinorPerHour: rateMinorPerHourSchema.nullable().optional(),
  })
  .refine((v) => v.externalRateMinorPerHour !== undefined, {
    message: 'Nothing to change: send externalRateMinorPerHour (a rate, or null for the academic rate)',
  });
export type NodeUpdateInput = z.infer<typeof nodeUpdateSchema>;
