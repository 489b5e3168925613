import { z } from 'zod';

/**
 * Largest id the database can hold: every id column is a PostgreSQL `integer` (serial), whose
 * range ends at 2³¹−1. A larger number in a path, query or body would reach the database and
 * fail there with a 500, so the edge refuses it with a 400 naming the field.
 */
export const MAX_DB_ID = 2_147_483_647;

const idMessage = 'must be a positive whole number';
const idRangeMessage = `must be at most ${MAX_DB_ID}`;

/** An id in a JSON body: a positive integer ≤ 2³¹−1. */
export const idSchema = z
  .number({ message: idMessage })
  .int({ message: idMessage })
  .positive({ message: idMessage })
  .max(MAX_DB_ID, { message: idRangeMessage });

/** An id in a path or query string: digits only (no `1e3`, `0x10`, spaces), then the same range as idSchema. */
export const idParam = z
  .string({ message: idMessage })
  .regex(/^\d{1,20}$/, { message: idMessage })
  .transform(Number)
  .pipe(z.number().int().positive({ message: idMessage }).max(MAX_DB_ID, { message: idRangeMessage }));

/** A row version (optimistic concurrency) in a body: same storage type as an id. */
export const versionSchema = idSchema;

/** `:id` route parameters. */
export const idParamSchema = z.object({ id: idParam });

/** `:id/…/:targetId` route parameters. */
export const targetParamsSchema = z.object({ id: idParam, targetId: idParam });

/** `:id/…/:memberId` route parameters. */
export const memberParamsSchema = z.object({ id: idParam, memberId: idParam });

/** `?nodeId=` query parameter. */
export const nodeIdQuerySchema = z.object({ nodeId: idParam });
