import { z } from 'zod';

const positiveId = z.coerce.number().int().positive({ message: 'must be a positive whole number' });

/** `:id` route parameters. */
export const idParamSchema = z.object({ id: positiveId });

/** `:id/…/:targetId` route parameters. */
export const targetParamsSchema = z.object({ id: positiveId, targetId: positiveId });

/** `:id/…/:memberId` route parameters. */
export const memberParamsSchema = z.object({ id: positiveId, memberId: positiveId });

/** `?nodeId=` of the sky-window route. */
export const nodeIdQuerySchema = z.object({ nodeId: positiveId });
