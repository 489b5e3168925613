import { httpResource } from '@angular/common/http';
import { Injectable } from '@angular/core';
import type { Cycle } from '@spincycle/shared/facility/facility-types';

/** Where a cycle's call stands now, as the server computes it. */
export type CycleStatus = 'upcoming' | 'open' | 'closed';

/** One row of GET /api/cycles. */
export type CycleListing = Cycle & { status: CycleStatus };

/** All HTTP of the home feature. */
@Injectable({ providedIn: 'root' })
export class CycleApi {
  /** GET /api/cycles. Call from an injection context (a component field). */
  listResource() {
    return httpResource<CycleListing[]>(() => '/api/cycles', { defaultValue: [] });
  }
}
