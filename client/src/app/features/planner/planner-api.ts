import { httpResource } from '@angular/common/http';
import { Injectable } from '@angular/core';
import type { CycleSummary, TelescopeNode } from '@spincycle/shared/facility/facility-types';

/** Reads of the target planner. Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class PlannerApi {
  /** GET /api/nodes: every node with its `site` nested. */
  nodesResource() {
    return httpResource<TelescopeNode[]>(() => '/api/nodes', { defaultValue: [] });
  }

  /** GET /api/cycles: every cycle with its call status and campaign window. */
  cyclesResource() {
    return httpResource<CycleSummary[]>(() => '/api/cycles', { defaultValue: [] });
  }
}
