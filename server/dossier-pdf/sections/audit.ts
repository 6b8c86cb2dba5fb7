import type { Content, TableCell } from 'pdfmake/interfaces';
import { dateTime, timestamp } from '../format';
import { caption, COLOURS, facts, heading, keepWithHeadings, MONO, splittable } from '../layout';
import type { DossierPdfModel } from '../model';

/** Section 8: the dossier's audit trail in full, as sentences, with the chain's state and head. */
export function auditSection(model: DossierPdfModel): Content[] {
  const { audit } = model;
  const broken = audit.firstBroken;
  const content: Content[] = [
    heading('8  Audit trail'),
    audit.verified
      ? {
          text: [
            { text: 'VERIFIED  ', bold: true, color: COLOURS.pass },
            `The whole audit chain was checked when this dossier was generated: each event links to the one before by its SHA-256, and no link is broken. ${audit.events.length.toLocaleString('en-GB')} events concern this dossier.`,
          ],
          margin: [0, 0, 0, 4],
        }
      : {
          text: [
            { text: 'BROKEN  ', bold: true, color: COLOURS.fail },
            'The audit chain does not verify',
            broken ? ` from event ${broken.id}${broken.at ? ` (${timestamp(broken.at)})` : ''}${broken.reason ? `: ${broken.reason}` : ''}` : '',
            '. A record was changed or removed after it was written; treat this dossier with suspicion.',
          ],
          margin: [0, 0, 0, 4],
        },
    facts([['Head of the chain (SHA-256)', { text: audit.headHash ?? '— (empty chain)', font: MONO, fontSize: 7.5 }]], 150),
    caption(
      model.revision.status === 'approved'
        ? 'The approval itself is recorded as the next event of the chain, with the SHA-256 of this signed file.'
        : 'Events are listed oldest first; the short hash identifies each event in the chain.',
    ),
  ];
  if (!audit.events.length) content.push({ text: 'No events are recorded for this dossier.', italics: true });
  else {
    content.push(
      splittable({
        header: [
          { text: 'Event', bold: true, fillColor: COLOURS.band },
          { text: 'Event hash', bold: true, fillColor: COLOURS.band },
        ],
        rows: audit.events.map((e): TableCell[] => [
          `${dateTime(e.at)} — ${e.sentence}`,
          { text: `${e.hash.slice(0, 12)}…`, font: MONO, fontSize: 7 },
        ]),
        widths: ['*', 70],
        fontSize: 8,
      }),
    );
  }
  return keepWithHeadings(content);
}
