import type { Logger } from 'pino';
import type { Config } from './config';
import type { Db } from './db/knex';
import type { Mailer } from './mail/mailer';

/** What every feature's routes need, built once by createApp (tests may pass their own parts). */
export interface AppContext {
  config: Config;
  db: Db;
  mailer: Mailer;
  logger: Logger;
}
