import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import type { AppContext } from '../../app-context';
import { listNodes, listSites } from './facility-repository';

/** The network's sites (every signed-in person may read them). */
export function getSites(ctx: AppContext): Promise<Site[]> {
  return listSites(ctx.db);
}

/** The network's nodes with their sites (every signed-in person may read them). */
export function getNodes(ctx: AppContext): Promise<TelescopeNode[]> {
  return listNodes(ctx.db);
}
