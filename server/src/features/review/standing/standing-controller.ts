import type { Request, Response } from 'express';
import { z } from 'zod';
import { idParam } from '@spincycle/shared/http/ids';
import { spreadThresholdSchema, standingMoveSchema, triageSchema } from '@spincycle/shared/review/standing';
import type { AppContext } from '../../../app-context';
import { getCyclePressure } from './pressure-service';
import { writeMatrixCsv, writeStandingCsv } from './standing-csv';
import { getPanelStatistics, getStanding, lockStanding, moveInPanelStanding, setSpreadThreshold, setTriage } from './standing-service';

const panelParamsSchema = z.object({ panelId: idParam });
const cycleParamsSchema = z.object({ cycleId: idParam });

/** A CSV download with a neutral file name (no panel, team or cycle name in it). */
function sendCsv(res: Response, filename: string, csv: string) {
  res.attachment(filename).type('text/csv; charset=utf-8').setHeader('Cache-Control', 'no-store');
  res.send(csv);
}

/** Handlers of review's standing/ sub-feature: parse, call the service, choose the status. */
export function createStandingController(ctx: AppContext) {
  return {
    async statistics(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await getPanelStatistics(ctx, req.user!, panelId));
    },
    async spreadThreshold(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      const { spreadThreshold } = spreadThresholdSchema.parse(req.body);
      res.json(await setSpreadThreshold(ctx, req.user!, panelId, spreadThreshold));
    },
    async triage(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      const { fraction } = triageSchema.parse(req.body);
      res.json(await setTriage(ctx, req.user!, panelId, fraction));
    },
    async standing(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await getStanding(ctx, req.user!, panelId));
    },
    async move(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      const input = standingMoveSchema.parse(req.body);
      res.status(201).json(await moveInPanelStanding(ctx, req.user!, panelId, input));
    },
    async lock(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await lockStanding(ctx, req.user!, panelId));
    },
    async matrixCsv(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      sendCsv(res, `panel-${panelId}-grades.csv`, writeMatrixCsv(await getPanelStatistics(ctx, req.user!, panelId)));
    },
    async standingCsv(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      sendCsv(res, `panel-${panelId}-standing.csv`, writeStandingCsv(await getStanding(ctx, req.user!, panelId)));
    },
    async pressure(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await getCyclePressure(ctx, req.user!, cycleId));
    },
  };
}
