/** Route parameter schemas: the shared id rules (positive, digits only, ≤ 2³¹−1), one source for every route. */
export { idParamSchema, memberParamsSchema, nodeIdQuerySchema, targetParamsSchema } from '@spincycle/shared/http/ids';
