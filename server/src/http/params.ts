import { z } from 'zod';

/** `:id` route parameters. */
export const idParamSchema = z.object({ id: z.coerce.number().int().positive({ message: 'must be a positive whole number' }) });
