// The signature page (manifestation of the electronic signatures): for every decision on this
// revision the signer's printed name, role, meaning, time with its zone and the content hash; for the
// approval, that the file carries the digital signature and a trusted timestamp.
import type { Content } from 'pdfmake/interfaces';
import { dateTime, timestamp } from '../format';
import { COLOURS, facts, heading, keepWithHeadings, mono, subheading } from '../layout';
import { approvalOf, decisionsOnRevision, type DossierPdfModel } from '../model';
import { DEVELOPMENT_MARK, TRUSTED_TIME_WORDS } from '../wording';
import { signerOf } from './review';

/** "AB:CD:…" split after the sixteenth byte, so the 95 characters fit the column on two lines. */
function fingerprintLines(fingerprint: string): string {
  const bytes = fingerprint.split(':');
  return bytes.length > 16 ? `${bytes.slice(0, 16).join(':')}:\n${bytes.slice(16).join(':')}` : fingerprint;
}

export function signatureSection(model: DossierPdfModel, signingTime: Date): Content[] {
  const approval = approvalOf(model);
  if (!approval) throw new Error('An approved dossier needs the approving review decision.');
  const signer = model.signer;
  const content: Content[] = [heading('9  Signatures', true)];
  for (const decision of decisionsOnRevision(model)) {
    const who = signerOf(decision);
    content.push(
      subheading(`${who.name}, ${who.role}: ${who.meaning}`),
      facts(
        [
          ['Signed by (printed name)', { text: who.name, bold: true }],
          ['Role', who.role],
          ['Meaning of the signature', { text: `${who.meaning} — revision ${model.revision.number} of “${model.dossier.title}”`, bold: true }],
          ['Date and time', `${dateTime(decision.at)} (${timestamp(decision.at)})`],
          ['E-mail', decision.reviewer.email],
          ['Content hash signed (SHA-256)', mono(decision.contentHash, 7.5)],
          ['Revision content hash (SHA-256)', mono(model.revision.contentHash, 7.5)],
          ['Comment', decision.comment || '(no comment)'],
        ],
        170,
      ),
    );
  }
  content.push(
    subheading('Digital signature of this file'),
    facts(
      [
        ['Applied', `At approval, ${timestamp(signingTime)} (the claimed time; see the timestamp)`],
        ['Signing certificate', signer.subject],
        ...(signer.fingerprintSha256
          ? ([['Certificate SHA-256 fingerprint', mono(fingerprintLines(signer.fingerprintSha256), 7.5)]] as Array<[string, Content]>)
          : []),
        [
          'Certificate kind',
          signer.kind === 'development' ? { text: DEVELOPMENT_MARK, bold: true, color: COLOURS.neutral } : 'Organisation certificate',
        ],
        [
          'Format',
          'PAdES baseline (ETSI EN 319 142-1): CAdES detached signature, SHA-256, with the signer’s chain and revocation data in the document security store',
        ],
        [
          'Trusted time',
          signer.timestampAuthority
            ? { text: [TRUSTED_TIME_WORDS.with, ` Authority: ${signer.timestampAuthority}`] }
            : { text: TRUSTED_TIME_WORDS.without, color: COLOURS.neutral, bold: true },
        ],
      ],
      170,
    ),
    {
      text: 'Any change to the signed part of this file invalidates the signature. Validate it against the trust anchors that Voltfall publishes (GET /api/signing/trust) in a PDF reader’s signature panel or with a command-line verifier, and compare the file’s SHA-256 with the copy the organisation holds.',
      margin: [0, 4, 0, 0],
    },
  );
  return keepWithHeadings(content);
}
