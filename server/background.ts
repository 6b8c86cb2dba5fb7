import type { Logger } from 'pino';

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
