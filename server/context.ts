import type { Logger } from 'pino';
import type { Sessions } from './auth/sessions';
import type { Throttle } from './auth/throttle';
import type { Background } from './background';
import type { Clock } from './clock';
import type { Config } from './config';
import type { Db } from './db/knex';
import type { Signing } from './signing/service';

/** What every component needs, built once at start-up and passed down (no module-level singletons). */
export interface AppContext {
  config: Config;
  db: Db;
  clock: Clock;
  sessions: Sessions;
  throttle: Throttle;
  log: Logger;
  /** Work that runs after an answer was sent. */
  background: Background;
  /** Asks the mail sender to deliver what is queued now (a no-op when mail is not configured). */
  kickMail: () => void;
  /** The signing identity, its trust anchors and its time-stamping authority. */
  signing: Signing;
  /** Absolute base URL for links in e-mails. */
  baseUrl: string;
}
