import type { Logger } from 'pino';
import type { AuthLucia } from './auth/lucia';
import type { Config } from './config';
import type { Db } from './db/knex';
import type { Signing } from './signing/service';

/** What every component needs, built once at start-up and passed down (no module-level singletons). */
export interface AppContext {
  config: Config;
  db: Db;
  lucia: AuthLucia;
  log: Logger;
  /** Asks the mail sender to deliver what is queued now (a no-op when mail is not configured). */
  kickMail: () => void;
  /** The signing identity, its trust anchors and its time-stamping authority. */
  signing: Signing;
  /** Absolute base URL for links in e-mails. */
  baseUrl: string;
}
