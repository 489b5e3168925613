import { httpResource } from '@angular/common/http';
import { Injectable } from '@angular/core';
import type { CallStatus, Cycle } from '@spincycle/shared/facility/facility-types';

/** The part of a GET /api/cycles row the home page reads. */
export type CycleListing = Cycle & { status: CallStatus };

/** All HTTP of the home feature. */
@Injectable({ providedIn: 'root' })
export class CycleApi {
  /** GET /api/cycles. Call from an injection context (a component field). */
  listResource() {
    return httpResource<CycleListing[]>(() => '/api/cycles', { defaultValue: [] });
  }
}
