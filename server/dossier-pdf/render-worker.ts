// The worker thread that renders and signs dossier PDFs, so pdfmake's layout and the signature's RSA
// work never hold up the server's event loop. One message in (a model, and the signing setup for an
// approved revision), one message out (the PDF bytes or the error message).
import { parentPort } from 'node:worker_threads';
import type { DossierPdfModel } from './model';
import { renderDossierPdf } from './render';
import type { SignOptions } from './sign';

export interface RenderJob {
  id: number;
  model: DossierPdfModel;
  sign?: SignOptions;
}

export type RenderAnswer = { id: number; pdf: Uint8Array } | { id: number; error: string };

parentPort!.on('message', (job: RenderJob) => {
  renderDossierPdf(job.model, job.sign ? { sign: job.sign } : {}).then(
    (pdf) => {
      const bytes = new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength);
      parentPort!.postMessage({ id: job.id, pdf: bytes } satisfies RenderAnswer);
    },
    (error: Error) => parentPort!.postMessage({ id: job.id, error: error.message } satisfies RenderAnswer),
  );
});
