import type { Content } from 'pdfmake/interfaces';
import { dateTime } from '../format';
import { COLOURS, heading, keepWithHeadings, MONO } from '../layout';
import type { DossierPdfModel, ReviewEntry } from '../model';
import { DECISION_MEANINGS, DECISION_WORDS } from '../wording';

/** The signer as recorded with the decision, or the reviewer for records older than that. */
export const signerOf = (r: ReviewEntry) => ({
  name: r.signerName || r.reviewer.name,
  role: r.signerRole || 'reviewer',
  meaning: r.meaning || DECISION_MEANINGS[r.decision],
});

/** Section 7: every decision on this dossier up to this revision, with its comment. */
export function reviewsSection(model: DossierPdfModel): Content[] {
  const content: Content[] = [heading('7  Review record')];
  if (!model.reviews.length) content.push({ text: 'No reviewer has decided on this dossier yet.', italics: true, margin: [0, 0, 0, 8] });
  for (const r of model.reviews) {
    const signer = signerOf(r);
    content.push({
      stack: [
        {
          text: [
            { text: DECISION_WORDS[r.decision], bold: true, color: r.decision === 'approve' ? COLOURS.pass : COLOURS.fail },
            `   Revision ${r.revisionNumber ?? model.revision.number}   ${dateTime(r.at)}   `,
            { text: signer.name, bold: true },
            ` (${signer.role}) <${r.reviewer.email}> — ${signer.meaning}`,
          ],
        },
        {
          text: [
            { text: 'Content hash at decision  ', color: COLOURS.muted, fontSize: 7.5 },
            { text: r.contentHash, font: MONO, fontSize: 7.5 },
          ],
        },
        { text: r.comment || '(no comment)', margin: [12, 2, 0, 0], italics: !r.comment },
      ],
      margin: [0, 0, 0, 8],
      unbreakable: true,
    });
  }
  return keepWithHeadings(content);
}
