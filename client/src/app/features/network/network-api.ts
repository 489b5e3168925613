import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import type { NodeUpdateInput } from '@spincycle/shared/facility/node-schemas';
import type { Observable } from 'rxjs';

/** All HTTP of the network feature. Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class NetworkApi {
  private readonly http = inject(HttpClient);

  /** GET /api/nodes: every node with its `site` nested. */
  nodesResource() {
    return httpResource<TelescopeNode[]>(() => '/api/nodes', { defaultValue: [] });
  }

  /** GET /api/sites */
  sitesResource() {
    return httpResource<Site[]>(() => '/api/sites', { defaultValue: [] });
  }

  /** PATCH /api/nodes/:id (facility managers): answers the node as it now stands. */
  updateNode(id: number, input: NodeUpdateInput): Observable<TelescopeNode> {
    return this.http.patch<TelescopeNode>(`/api/nodes/${id}`, input);
  }
}
