import { pdfkitAddPlaceholder } from '@signpdf/placeholder-pdfkit';
import { P12Signer } from '@signpdf/signer-p12';
import { SignPdf } from '@signpdf/signpdf';
import { SUBFILTER_ADOBE_PKCS7_DETACHED } from '@signpdf/utils';
import type { SigningIdentity } from './certificate';

export interface SignOptions {
  identity: SigningIdentity;
  /** Shown by PDF readers in the signature panel. */
  reason?: string;
  location?: string;
  contactInfo?: string;
  /** Defaults to now; the same instant goes into the PDF signature dictionary and the CMS attribute. */
  signingTime?: Date;
}

/** The pdfkit document pdfmake builds; only what the placeholder needs is named here. */
export interface PdfKitDocumentLike {
  ref(data: object): unknown;
}

/**
 * Adds the signature dictionary, its empty /Contents and an invisible widget on the current (last)
 * page, before the document is ended. CMS detached with SHA-256 (adbe.pkcs7.detached sub-filter).
 */
export function addSignaturePlaceholder(pdf: PdfKitDocumentLike, options: SignOptions, signingTime: Date): void {
  // The refs returned here are already ended by the library; ending them again makes the PDF hang.
  pdfkitAddPlaceholder({
    pdf,
    // The library's type asks for pdfBuffer, but its pdfkit variant never reads it.
    pdfBuffer: Buffer.alloc(0),
    reason: options.reason ?? 'Approval of the revision',
    contactInfo: options.contactInfo ?? '',
    name: options.identity.subject,
    location: options.location ?? '',
    signingTime,
    signatureLength: signatureLength(options.identity),
    subFilter: SUBFILTER_ADOBE_PKCS7_DETACHED,
    appName: 'Voltfall',
  });
}

/** Fills the placeholder with a detached CMS signature over the byte ranges around it. */
export async function signPdf(pdfWithPlaceholder: Buffer, options: SignOptions, signingTime: Date): Promise<Buffer> {
  const signer = new P12Signer(options.identity.p12, { passphrase: options.identity.password });
  // Under ESM the default export's bound `sign` is not reliable; an instance is.
  return new SignPdf().sign(pdfWithPlaceholder, signer, signingTime);
}

/** Room for the CMS: every certificate in the PKCS#12 travels in it, plus the signature and attributes. */
function signatureLength(identity: SigningIdentity): number {
  return Math.max(8192, identity.p12.length + 4096);
}
