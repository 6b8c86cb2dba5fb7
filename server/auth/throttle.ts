import type { Request } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';
import type { Clock } from '../clock';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { AppError } from '../errors';
import { deleteBucket, deleteBucketsOlderThan, ensureBuckets, findBuckets, giveBackAttempt, saveBucket } from './store';

/** `free` attempts, then each further one waits base · 2^(failures − free), at most `maxMs`; forgotten after `forgetMs` of quiet. */
interface ThrottleRule {
  free: number;
  baseMs: number;
  maxMs: number;
  forgetMs: number;
}

export interface ThrottleKey {
  key: string;
  rule: ThrottleRule;
}

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

type ThrottleVerdict = { ok: true } | { ok: false; retryAfterMs: number };

/**
 * Attempt counting kept in the database, so it holds across restarts and instances. An attempt is
 * counted before it is judged (and given back when it succeeds), so parallel guesses cannot slip
 * through between the check and the count.
 */
export class Throttle {
  readonly rules: { account: ThrottleRule; address: ThrottleRule; resetAccount: ThrottleRule };

  constructor(
    private readonly db: Db,
    private readonly clock: Clock,
    config: Pick<Config, 'signInFreeFailuresPerAccount' | 'signInLimitPer15Min'>,
  ) {
    this.rules = {
      account: { free: config.signInFreeFailuresPerAccount, baseMs: MINUTE, maxMs: HOUR, forgetMs: 24 * HOUR },
      address: { free: config.signInLimitPer15Min, baseMs: 15 * MINUTE, maxMs: HOUR, forgetMs: HOUR },
      resetAccount: { free: 3, baseMs: 15 * MINUTE, maxMs: HOUR, forgetMs: HOUR },
    };
  }

  /** The sign-in keys: the account as the schema normalised it, and the client address. */
  signInKeys(email: string, address: string): ThrottleKey[] {
    return [
      { key: `account:${email}`, rule: this.rules.account },
      { key: `address:${address}`, rule: this.rules.address },
    ];
  }

  /** Counts one attempt against every key, unless one of them is still waiting. */
  reserve(keys: ThrottleKey[]): Promise<ThrottleVerdict> {
    return this.db.transaction(async (trx) => {
      const now = this.clock.now();
      await ensureBuckets(
        trx,
        keys.map((k) => k.key),
        now,
      );
      const stored = new Map(
        (
          await findBuckets(
            trx,
            keys.map((k) => k.key),
          )
        ).map((b) => [b.key, b]),
      );
      const counted = keys.map(({ key, rule }) => {
        const bucket = stored.get(key);
        const failures = bucket && now - bucket.last_failure_at < rule.forgetMs ? bucket.failures : 0;
        const waitUntil = failures >= rule.free ? bucket!.last_failure_at + Math.min(rule.maxMs, rule.baseMs * 2 ** (failures - rule.free)) : 0;
        return { key, failures, wait: waitUntil - now };
      });
      const wait = Math.max(...counted.map((c) => c.wait));
      if (wait > 0) return { ok: false as const, retryAfterMs: wait };
      for (const c of counted) await saveBucket(trx, { key: c.key, failures: c.failures + 1, last_failure_at: now });
      return { ok: true as const };
    });
  }

  /** A successful sign-in clears the account's failures and gives the address its attempt back. */
  async succeeded(keys: ThrottleKey[]): Promise<void> {
    const [account, ...others] = keys;
    await deleteBucket(this.db, account.key);
    await giveBackAttempt(
      this.db,
      others.map((k) => k.key),
    );
  }

  /** Forgets buckets quiet for longer than any rule remembers; the periodic sweep calls it. */
  sweep(): Promise<number> {
    const longest = Math.max(...Object.values(this.rules).map((r) => r.forgetMs));
    return deleteBucketsOlderThan(this.db, this.clock.now() - longest);
  }
}

/** The client's address as the throttle keys it: IPv6 by /56 (one household or host gets one bucket). */
export function clientAddress(req: Request): string {
  return ipKeyGenerator(req.ip ?? req.socket.remoteAddress ?? 'unknown');
}

export function tooManyAttempts(retryAfterMs: number, what = 'sign-in attempts'): AppError {
  const minutes = Math.max(1, Math.ceil(retryAfterMs / MINUTE));
  return new AppError(429, 'too_many_attempts', `Too many ${what}. Wait ${minutes} minute${minutes === 1 ? '' : 's'}, then try again.`, undefined, {
    headers: { 'Retry-After': String(Math.ceil(retryAfterMs / 1000)) },
  });
}
