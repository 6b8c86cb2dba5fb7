import { randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import type { Db } from '../db/knex';
import { findLease, releaseLease, takeLease, takeLeaseFrom } from './store';

/** This process, as lease holders are named: `<host>/<pid>/<random>` (the random part tells a restarted pid apart). */
export const PROCESS_HOLDER = `${hostname()}/${process.pid}/${randomBytes(4).toString('hex')}`;

function deadOnThisHost(holder: string): boolean {
  const [host, pid] = holder.split('/');
  if (host !== hostname() || holder === PROCESS_HOLDER) return false;
  try {
    process.kill(Number(pid), 0);
    return false;
  } catch (err) {
    // EPERM: the process exists but belongs to someone else.
    return (err as NodeJS.ErrnoException).code === 'ESRCH';
  }
}

/**
 * A database lease on one periodic job, so that among all instances sharing the database one runs it
 * at a time. The holder renews it on each run; when the holder dies, another instance takes it once
 * it expires — at once when the dead holder ran on the same machine (a restarted process).
 */
export class JobLease {
  constructor(
    private readonly db: Db,
    readonly name: string,
    private readonly ttlMs: number,
    readonly holder = PROCESS_HOLDER,
    private readonly now: () => number = Date.now,
  ) {}

  /** True when this process holds the lease now (taken, renewed or taken over). */
  async take(): Promise<boolean> {
    const now = this.now();
    // A read decides most runs, so a quiet job does not take a write lock each time: renewed only once
    // half the lease has passed, left alone while another live holder has it.
    const current = await findLease(this.db, this.name);
    if (current?.holder === this.holder && current.expires_at - now > this.ttlMs / 2) return true;
    if (current && current.holder !== this.holder && current.expires_at > now) {
      return deadOnThisHost(current.holder) && takeLeaseFrom(this.db, this.name, current.holder, this.holder, now, this.ttlMs);
    }
    return takeLease(this.db, this.name, this.holder, now, this.ttlMs);
  }

  async release(): Promise<void> {
    await releaseLease(this.db, this.name, this.holder);
  }

  /** Runs `work` only while this process holds the lease; answers whether it ran. */
  async runIfHeld(work: () => Promise<void>): Promise<boolean> {
    if (!(await this.take())) return false;
    await work();
    return true;
  }
}

/** How long a job's lease lasts: three of its periods (a missed run or two is not a death), at least 15 s. */
export const leaseTtl = (intervalMs: number) => Math.max(3 * intervalMs, 15_000);
