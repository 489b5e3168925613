import { httpResource } from '@angular/common/http';
import { Injectable } from '@angular/core';
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';

/** All HTTP of the network feature. Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class NetworkApi {
  /** GET /api/nodes: every node with its `site` nested. */
  nodesResource() {
    return httpResource<TelescopeNode[]>(() => '/api/nodes', { defaultValue: [] });
  }

  /** GET /api/sites */
  sitesResource() {
    return httpResource<Site[]>(() => '/api/sites', { defaultValue: [] });
  }
}
