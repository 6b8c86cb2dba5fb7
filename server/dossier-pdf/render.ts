import { createRequire } from 'node:module';
import { dirname, join, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces';
import { timestamp } from './format';
import { approvalOf, type DossierPdfModel } from './model';
import { CONTENT_WIDTH, FONT, MONO } from './layout';
import { auditSection } from './sections/audit';
import { changesSection } from './sections/changes';
import { chartSection } from './sections/chart';
import { checksSection } from './sections/checks';
import { contents } from './sections/contents';
import { cover } from './sections/cover';
import { evidenceSection } from './sections/evidence';
import { inputsSection } from './sections/inputs';
import { reviewsSection } from './sections/review';
import { signatureSection } from './sections/signature';
import { worstCaseSection } from './sections/worst-case';
import { addSignaturePlaceholder, signPdf, type SignOptions } from './sign';
import { CAUTION_LINE, NOT_APPROVED_MARK, STATUS_SHORT } from './wording';

export type { SignOptions } from './sign';

interface RenderOptions {
  /** Required for an approved revision, refused for any other: only approved dossiers are signed. */
  sign?: SignOptions;
}

// pdfmake ships CommonJS that assigns an instance to module.exports; Node's ESM loader cannot see its
// named exports, so it is loaded through require with the declared types.
const pdfmake = createRequire(import.meta.url)('pdfmake') as typeof import('pdfmake');

const FONTS_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'fonts');
const fontFile = (name: string) => join(FONTS_DIR, name);

let configured = false;

/**
 * Fonts are given as files, not through pdfmake's in-memory store: the SVG renderer of the chart opens
 * font files by path and cannot see that store. The access policies keep every document to those files.
 */
function configurePdfmake(): void {
  if (configured) return;
  pdfmake.setFonts({
    [FONT]: {
      normal: fontFile('DejaVuSans.ttf'),
      bold: fontFile('DejaVuSans-Bold.ttf'),
      italics: fontFile('DejaVuSans-Oblique.ttf'),
      bolditalics: fontFile('DejaVuSans-BoldOblique.ttf'),
    },
    [MONO]: {
      normal: fontFile('DejaVuSansMono.ttf'),
      bold: fontFile('DejaVuSansMono.ttf'),
      italics: fontFile('DejaVuSansMono.ttf'),
      bolditalics: fontFile('DejaVuSansMono.ttf'),
    },
  });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy((path) => resolve(path).startsWith(FONTS_DIR + sep));
  configured = true;
}

/**
 * Renders the dossier of one revision. An approved revision must be given `sign` and comes back signed
 * (PAdES baseline B-LT: CAdES detached, SHA-256, timestamp, security store) with a signature page; any
 * other status comes back unsigned and marked "NOT APPROVED — not for certification" on every page.
 */
export async function renderDossierPdf(model: DossierPdfModel, options: RenderOptions = {}): Promise<Buffer> {
  const approved = model.revision.status === 'approved';
  if (approved) assertSignable(model, options.sign);
  if (!approved && options.sign) {
    throw new Error(`Only an approved revision is signed; this one is ${model.revision.status}.`);
  }
  configurePdfmake();
  const signingTime = options.sign?.signingTime ?? new Date();
  const definition = documentDefinition(model, signingTime);
  const kit = await pdfmake.createPdf(definition).getStream();
  if (!options.sign) return collect(kit);
  addSignaturePlaceholder(kit, options.sign, signingTime);
  return (await signPdf(await collect(kit), options.sign, signingTime)).pdf;
}

function assertSignable(model: DossierPdfModel, sign: SignOptions | undefined): asserts sign is SignOptions {
  if (!sign) throw new Error('An approved revision is always signed: pass the signing identity.');
  const approval = approvalOf(model);
  if (!approval) throw new Error('An approved revision needs its approving review decision in the model.');
  if (approval.contentHash !== model.revision.contentHash) {
    throw new Error(
      `The approval covers content hash ${approval.contentHash}, but the revision hashes to ${model.revision.contentHash}; refusing to sign.`,
    );
  }
  if (sign.setup.identity.kind !== model.signer.kind) {
    throw new Error(`The model names a ${model.signer.kind} signer but the identity is a ${sign.setup.identity.kind} certificate.`);
  }
}

function collect(kit: NodeJS.ReadableStream & { end(): void }): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    kit.on('data', (chunk: Buffer) => chunks.push(chunk));
    kit.on('end', () => resolve(Buffer.concat(chunks)));
    kit.on('error', reject);
    kit.end();
  });
}

function documentDefinition(model: DossierPdfModel, signingTime: Date): TDocumentDefinitions {
  const approved = model.revision.status === 'approved';
  const { product, dossier, revision } = model;
  const content: Content[] = [
    ...cover(model),
    ...contents(),
    ...inputsSection(model),
    ...checksSection(model),
    ...worstCaseSection(model),
    ...chartSection(model),
    ...evidenceSection(model),
    ...changesSection(model),
    ...reviewsSection(model),
    ...auditSection(model),
    // Last, so the signature widget lands on the page that explains it.
    ...(approved ? signatureSection(model, signingTime) : []),
  ];
  const running = `${product.name} (${product.modelNumber}) · ${dossier.title} · Revision ${revision.number}`;
  return {
    pageSize: 'A4',
    pageMargins: [40, approved ? 52 : 62, 40, 56],
    info: {
      title: `${dossier.title} — revision ${revision.number}`,
      author: model.organisation,
      subject: `Capacitor discharge compliance dossier: ${product.name} ${product.modelNumber}`,
      creator: 'Voltfall',
      producer: 'Voltfall',
    },
    defaultStyle: { font: FONT, fontSize: 8.5, lineHeight: 1.2 },
    styles: {
      title: { fontSize: 20, bold: true },
      h1: { fontSize: 13, bold: true, margin: [0, 10, 0, 6] },
      h2: { fontSize: 10, bold: true, margin: [0, 8, 0, 3] },
    },
    header: (currentPage: number) => ({
      margin: [40, 20, 40, 0],
      stack: [
        {
          columns: [
            { text: running, fontSize: 7, color: '#5f6368', width: '*' },
            { text: `Status: ${STATUS_SHORT[revision.status]}`, fontSize: 7, bold: true, alignment: 'right', width: 'auto' },
          ],
        },
        ...(approved ? [] : [{ text: NOT_APPROVED_MARK, fontSize: 9, bold: true, color: '#b71c1c', margin: [0, 3, 0, 0] } as Content]),
        { canvas: [{ type: 'line', x1: 0, y1: 3, x2: CONTENT_WIDTH, y2: 3, lineWidth: 0.5, lineColor: currentPage === 1 ? '#ffffff' : '#c8c8c8' }] },
      ],
    }),
    footer: (currentPage: number, pageCount: number) => ({
      margin: [40, 12, 40, 0],
      stack: [
        // Every page that shows a result carries the caution line; the cover has the cautions in full.
        ...(currentPage === 1 ? [] : [{ text: CAUTION_LINE, fontSize: 6.5, color: '#b71c1c', margin: [0, 0, 0, 3] } as Content]),
        {
          columns: [
            {
              text: `${model.organisation} · generated ${timestamp(model.generatedAt)} · content hash ${revision.contentHash.slice(0, 16)}…`,
              fontSize: 7,
              color: '#5f6368',
            },
            { text: `Page ${currentPage} of ${pageCount}`, fontSize: 7.5, alignment: 'right', width: 'auto' },
          ],
        },
      ],
    }),
    ...(approved ? {} : { watermark: { text: NOT_APPROVED_MARK, color: '#b71c1c', opacity: 0.12, bold: true, font: FONT, fontSize: 34 } }),
    content,
  };
}
