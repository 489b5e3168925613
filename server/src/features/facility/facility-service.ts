import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import type { NodeUpdateInput } from '@spincycle/shared/facility/node-schemas';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { listNodes, listSites, updateNodeRow } from './facility-repository';

/** The network's sites (every signed-in person may read them). */
export function getSites(ctx: AppContext): Promise<Site[]> {
  return listSites(ctx.db);
}

/** The network's nodes with their sites (every signed-in person may read them). */
export function getNodes(ctx: AppContext): Promise<TelescopeNode[]> {
  return listNodes(ctx.db);
}

/**
 * Changes a node's editable fields (today its external rate; facility managers only, checked by
 * the route) and answers the node as it now stands. Issued invoices keep the rates they were
 * issued with; drafts take the new rate when they are next prepared (docs/billing.md).
 */
export async function updateNode(ctx: AppContext, id: number, input: NodeUpdateInput): Promise<TelescopeNode> {
  return ctx.db.transaction(async (trx) => {
    if (!(await updateNodeRow(trx, id, input))) throw new AppError('node_not_found', `No node ${id}`, 404);
    const [node] = await listNodes(trx, [id]);
    return node;
  });
}
