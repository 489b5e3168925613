import type { Request, Response } from 'express';
import { CALENDAR_FEED_MAX_AGE_SECONDS } from '@spincycle/shared/night-plans/night-plans';
import type { AppContext } from '../../app-context';
import { readCalendarFeed } from './calendar-feed-service';

/** Handler of the public calendar feed: the service judges the token (anything wrong is 404). */
export function createCalendarFeedController(ctx: AppContext) {
  return {
    async feed(req: Request, res: Response) {
      const file = await readCalendarFeed(ctx, String(req.params['token'] ?? ''));
      res.setHeader('Content-Type', file.contentType);
      res.setHeader('Content-Disposition', `inline; filename="${file.filename}"`);
      // Private: the address is a secret; a shared cache must not keep the plan.
      res.setHeader('Cache-Control', `private, max-age=${CALENDAR_FEED_MAX_AGE_SECONDS}`);
      res.send(file.body);
    },
  };
}
