// Placement of the signature in the PDF: @signpdf writes the signature dictionary and its byte
// ranges (placeholder-pdfkit, since pdfmake builds on pdfkit), our CAdES signer fills /Contents,
// and the document security store follows as an incremental update (PAdES baseline B-LT).
import { pdfkitAddPlaceholder } from '@signpdf/placeholder-pdfkit';
import { SignPdf } from '@signpdf/signpdf';
import { Signer, SUBFILTER_ETSI_CADES_DETACHED } from '@signpdf/utils';
import { cadesDetachedSignature, type CadesSignature } from '../signing/cades';
import { appendDss } from '../signing/dss';
import type { SigningSetup } from '../signing/identity';
import { validationData } from '../signing/revocation';

export interface SignOptions {
  setup: SigningSetup;
  /** Shown by PDF readers in the signature panel. */
  reason?: string;
  location?: string;
  contactInfo?: string;
  /** The claimed signing time (/M); the trusted time comes from the timestamp. Defaults to now. */
  signingTime?: Date;
}

/** The pdfkit document pdfmake builds; only what the placeholder needs is named here. */
interface PdfKitDocumentLike {
  ref(data: object): unknown;
}

/**
 * Adds the signature dictionary (SubFilter ETSI.CAdES.detached), its empty /Contents and an invisible
 * widget on the current (last) page, before the document is ended.
 */
export function addSignaturePlaceholder(pdf: PdfKitDocumentLike, options: SignOptions, signingTime: Date): void {
  // The refs returned here are already ended by the library; ending them again makes the PDF hang.
  pdfkitAddPlaceholder({
    pdf,
    // The library's type asks for pdfBuffer, but its pdfkit variant never reads it.
    pdfBuffer: Buffer.alloc(0),
    reason: options.reason ?? 'Approval of the revision',
    contactInfo: options.contactInfo ?? '',
    name: options.setup.identity.commonName,
    location: options.location ?? '',
    signingTime,
    signatureLength: signatureLength(options.setup),
    subFilter: SUBFILTER_ETSI_CADES_DETACHED,
    appName: 'Voltfall',
  });
}

class CadesSigner extends Signer {
  result: CadesSignature | null = null;

  constructor(private readonly setup: SigningSetup) {
    super();
  }

  async sign(signedBytes: Buffer): Promise<Buffer> {
    this.result = await cadesDetachedSignature(new Uint8Array(signedBytes), this.setup);
    return Buffer.from(this.result.cms);
  }
}

interface SignedPdf {
  pdf: Buffer;
  /** The trusted time of the signature timestamp; null when signed without one. */
  timestampedAt: Date | null;
}

/** Fills the placeholder with the CAdES signature over the byte ranges around it, then appends the DSS. */
export async function signPdf(pdfWithPlaceholder: Buffer, options: SignOptions, signingTime: Date): Promise<SignedPdf> {
  const signer = new CadesSigner(options.setup);
  // Under ESM the default export's bound `sign` is not reliable; an instance is.
  const signed = await new SignPdf().sign(pdfWithPlaceholder, signer, signingTime);
  const timestamp = signer.result?.timestamp ?? null;
  return { pdf: appendDss(signed, await validationData(options.setup, timestamp)), timestampedAt: timestamp?.genTime ?? null };
}

/** Room for the CMS: the signer's chain, the signature and attributes, and the timestamp token with its chain. */
function signatureLength(setup: SigningSetup): number {
  const chain = [setup.identity.certificate, ...setup.identity.chain].reduce((sum, c) => sum + c.length, 0);
  return 12_288 + chain;
}
