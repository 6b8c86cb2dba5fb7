// Renders dossier PDFs in one long-lived worker thread (started on first use, restarted after a crash),
// so a request that renders or signs waits for the worker while the event loop keeps serving others.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { DossierPdfModel } from './model';
import type { RenderAnswer, RenderJob } from './render-worker';
import type { SignOptions } from './sign';

const WORKER_ENTRY = join(dirname(fileURLToPath(import.meta.url)), 'render-worker.mjs');

interface Pending {
  resolve(pdf: Buffer): void;
  reject(error: Error): void;
}

export class PdfRenderPool {
  private worker: Worker | null = null;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;

  render(model: DossierPdfModel, sign?: SignOptions): Promise<Buffer> {
    const worker = this.worker ?? this.start();
    const id = this.nextId++;
    return new Promise<Buffer>((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      // Only pending jobs keep the process alive, not an idle worker.
      worker.ref();
      worker.postMessage({ id, model, sign } satisfies RenderJob);
    });
  }

  /** Starts the worker now, so the first approval does not wait for it to load its modules. */
  warm(): void {
    this.worker ??= this.start();
  }

  async close(): Promise<void> {
    const worker = this.worker;
    this.worker = null;
    await worker?.terminate();
  }

  private start(): Worker {
    const worker = new Worker(WORKER_ENTRY);
    worker.unref();
    worker.on('message', (answer: RenderAnswer) => {
      const job = this.pending.get(answer.id);
      if (!job) return;
      this.pending.delete(answer.id);
      if (!this.pending.size) worker.unref();
      if ('error' in answer) job.reject(new Error(answer.error));
      else job.resolve(Buffer.from(answer.pdf.buffer, answer.pdf.byteOffset, answer.pdf.byteLength));
    });
    const fail = (error: Error) => {
      if (this.worker === worker) this.worker = null;
      for (const job of this.pending.values()) job.reject(error);
      this.pending.clear();
    };
    worker.on('error', fail);
    worker.on('exit', (code) => fail(new Error(`The PDF worker stopped (exit code ${code}).`)));
    this.worker = worker;
    return worker;
  }
}
