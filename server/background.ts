import type { Logger } from 'pino';
import type { JobLease } from './leases/lease';

/**
 * A periodic job that never takes the process down: a failure (a busy or full database, a mail relay
 * that hangs up) is logged and the job runs again after a growing pause — 0.5 s, 1 s, 2 s … up to a
 * minute — and back on its normal cadence after the first success. With a lease, a scheduled run does
 * the work only while this process holds the job's lease (one instance among those sharing the
 * database); `runNow` is a direct request and runs it here regardless.
 */
export class BackgroundLoop {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private running: Promise<void> | null = null;
  private failures = 0;
  private stopped = true;

  constructor(
    private readonly name: string,
    private readonly work: () => Promise<void>,
    private readonly log: Logger,
    private readonly intervalMs: number,
    private readonly lease: JobLease | null = null,
    private readonly maxBackoffMs = 60_000,
  ) {}

  start(): void {
    this.stopped = false;
    this.schedule(this.intervalMs);
  }

  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    await this.running;
    // A clean stop hands the job to another instance at once instead of after the lease expires.
    await this.lease?.release().catch((err: unknown) => this.log.warn({ err, job: this.name }, `could not release the lease of ${this.name}`));
  }

  /** Runs the job now (a run in progress is shared); resolves when it is done, never rejects. */
  runNow(): Promise<void> {
    return this.run(this.work);
  }

  private run(work: () => Promise<void>): Promise<void> {
    this.running ??= work()
      .then(() => {
        this.failures = 0;
      })
      .catch((err: unknown) => {
        this.failures += 1;
        this.log.warn({ err, job: this.name, failures: this.failures }, `${this.name} failed; retrying`);
      })
      .finally(() => {
        this.running = null;
        if (!this.stopped) this.schedule(this.failures ? Math.min(500 * 2 ** (this.failures - 1), this.maxBackoffMs) : this.intervalMs);
      });
    return this.running;
  }

  private schedule(delayMs: number): void {
    if (this.timer) clearTimeout(this.timer);
    const lease = this.lease;
    this.timer = setTimeout(() => void this.run(lease ? async () => void (await lease.runIfHeld(this.work)) : this.work), delayMs);
  }
}

/**
 * Work that runs after the answer has gone out (so the answer's timing does not depend on it). A
 * failure is logged, never thrown into a request; closing the server waits for what is still running.
 */
export class Background {
  private readonly pending = new Set<Promise<void>>();

  constructor(private readonly log: Logger) {}

  run(label: string, work: () => Promise<void>): void {
    const task = work()
      .catch((err: unknown) => this.log.error({ err, task: label }, 'background task failed'))
      .finally(() => this.pending.delete(task));
    this.pending.add(task);
  }

  async settled(): Promise<void> {
    while (this.pending.size) await Promise.all(this.pending);
  }
}
