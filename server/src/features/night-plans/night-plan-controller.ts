import type { Request, Response } from 'express';
import { z } from 'zod';
import { idParam } from '@spincycle/shared/http/ids';
import { lostNightSchema, timelineQuerySchema, visitStatusSchema } from '@spincycle/shared/night-plans/night-plans';
import type { AppContext } from '../../app-context';
import { getCalendarFeed, makeCalendarFeed, stopCalendarFeed } from './calendar-feed-service';
import {
  exportNodePlan,
  getLatestBuild,
  getNightPlan,
  getNightPlanOverview,
  getNodeTimeline,
  getProgramProgress,
  listNightPlanCycles,
  markLostNight,
  requestBuild,
  setVisitStatus,
  unmarkLostNight,
  uploadExecution,
} from './night-plan-service';

const localDate = z.iso.date({ message: 'use a date YYYY-MM-DD' });
const cycleParams = z.object({ cycleId: idParam });
const nodeParams = z.object({ cycleId: idParam, nodeId: idParam });
const nightParams = z.object({ cycleId: idParam, nodeId: idParam, date: localDate });
const visitParams = z.object({ visitId: idParam });
const proposalParams = z.object({ proposalId: idParam });

/** Handlers of /api/night-plans: parse, call the service, choose the status. */
export function createNightPlanController(ctx: AppContext) {
  const exportPlan = (format: 'csv' | 'ics') => async (req: Request, res: Response) => {
    const { cycleId, nodeId } = nodeParams.parse(req.params);
    const file = await exportNodePlan(ctx, cycleId, nodeId, format);
    res.setHeader('Content-Type', file.contentType);
    res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
    res.setHeader('Cache-Control', 'no-store');
    res.send(file.body);
  };
  return {
    async cycles(_req: Request, res: Response) {
      res.json(await listNightPlanCycles(ctx));
    },
    async overview(req: Request, res: Response) {
      const { cycleId } = cycleParams.parse(req.params);
      res.json(await getNightPlanOverview(ctx, cycleId));
    },
    async build(req: Request, res: Response) {
      const { cycleId } = cycleParams.parse(req.params);
      res.status(202).json(await requestBuild(ctx, req.user!, cycleId));
    },
    async latestBuild(req: Request, res: Response) {
      const { cycleId } = cycleParams.parse(req.params);
      res.json(await getLatestBuild(ctx, cycleId));
    },
    async timeline(req: Request, res: Response) {
      const { cycleId, nodeId } = nodeParams.parse(req.params);
      const range = timelineQuerySchema.parse(req.query);
      res.json(await getNodeTimeline(ctx, cycleId, nodeId, range));
    },
    async night(req: Request, res: Response) {
      const { cycleId, nodeId, date } = nightParams.parse(req.params);
      res.json(await getNightPlan(ctx, cycleId, nodeId, date));
    },
    async markLost(req: Request, res: Response) {
      const { cycleId, nodeId } = nodeParams.parse(req.params);
      const input = lostNightSchema.parse(req.body);
      res.status(202).json(await markLostNight(ctx, req.user!, cycleId, nodeId, input));
    },
    async unmarkLost(req: Request, res: Response) {
      const { cycleId, nodeId, date } = nightParams.parse(req.params);
      await unmarkLostNight(ctx, req.user!, cycleId, nodeId, date);
      res.status(204).end();
    },
    async visitStatus(req: Request, res: Response) {
      const { visitId } = visitParams.parse(req.params);
      const { status } = visitStatusSchema.parse(req.body);
      res.json(await setVisitStatus(ctx, req.user!, visitId, status));
    },
    async execution(req: Request, res: Response) {
      const { cycleId } = cycleParams.parse(req.params);
      res.json(await uploadExecution(ctx, req.user!, cycleId, req.file));
    },
    planCsv: exportPlan('csv'),
    planIcs: exportPlan('ics'),
    async calendarFeed(req: Request, res: Response) {
      const { cycleId, nodeId } = nodeParams.parse(req.params);
      res.setHeader('Cache-Control', 'no-store');
      res.json(await getCalendarFeed(ctx, cycleId, nodeId));
    },
    async makeCalendarFeed(req: Request, res: Response) {
      const { cycleId, nodeId } = nodeParams.parse(req.params);
      // The link's secret is in this answer only: no cache may keep it.
      res.setHeader('Cache-Control', 'no-store');
      res.status(201).json(await makeCalendarFeed(ctx, req.user!, cycleId, nodeId));
    },
    async stopCalendarFeed(req: Request, res: Response) {
      const { cycleId, nodeId } = nodeParams.parse(req.params);
      await stopCalendarFeed(ctx, req.user!, cycleId, nodeId);
      res.status(204).end();
    },
    async program(req: Request, res: Response) {
      const { proposalId } = proposalParams.parse(req.params);
      res.json(await getProgramProgress(ctx, req.user!, proposalId));
    },
  };
}
