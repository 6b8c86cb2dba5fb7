import type { Content } from 'pdfmake/interfaces';
import type { Requirement } from '../../../shared/schema/discharge';
import { quantity, timestamp } from '../format';
import { band, COLOURS, facts, mono } from '../layout';
import { approvalOf, decisionsOnRevision, type DossierPdfModel } from '../model';
import { CAUTIONS, DEVELOPMENT_MARK, NOT_APPROVED_MARK, STATUS_WORDS, TRUSTED_TIME_WORDS, VERDICT_WORDS } from '../wording';

function limitSentence(req: Requirement): string {
  const parts = [`voltage at or below ${quantity(req.safeVoltage, 'V')} within ${quantity(req.maxTime, 's')}`];
  if (req.maxEnergy != null) parts.push(`or stored energy at most ${quantity(req.maxEnergy, 'J')}`);
  if (req.maxCharge != null) parts.push(`or stored charge at most ${quantity(req.maxCharge, 'C')}`);
  let sentence = parts.join(', ');
  if (req.fallbackMaxTime != null) sentence += `; passive bleeders alone within ${quantity(req.fallbackMaxTime, 's')}`;
  return sentence;
}

export function cover(model: DossierPdfModel): Content[] {
  const { revision, dossier, product, signer } = model;
  const req = dossier.requirement;
  const approved = revision.status === 'approved';
  const decisions = decisionsOnRevision(model);
  const reviewer = approved ? approvalOf(model) : (decisions[decisions.length - 1] ?? null);

  const content: Content[] = [
    { text: model.organisation, color: COLOURS.muted, fontSize: 10, margin: [0, 0, 0, 14] },
    { text: 'Capacitor discharge compliance dossier', fontSize: 11, color: COLOURS.muted },
    { text: dossier.title, style: 'title', margin: [0, 2, 0, 4] },
    { text: `${product.name} — model ${product.modelNumber}`, fontSize: 12, bold: true },
    ...(product.description ? [{ text: product.description, color: COLOURS.muted, margin: [0, 2, 0, 0] } as Content] : []),
    band(
      { text: approved ? 'Approved — digitally signed' : NOT_APPROVED_MARK, bold: true, fontSize: 12 },
      approved ? COLOURS.pass : COLOURS.fail,
      '#ffffff',
      [0, 12, 0, 4],
    ),
  ];
  if (signer.kind === 'development') {
    content.push(
      band(
        {
          stack: [
            { text: DEVELOPMENT_MARK, bold: true },
            {
              text: `${approved ? 'Signed' : 'Approved dossiers are signed'} with a certificate from this installation’s own development CA, and timestamped by its local development time-stamping authority; neither identifies an organisation.`,
              fontSize: 8,
            },
          ],
        },
        '#fff4d6',
        COLOURS.neutral,
      ),
    );
  }
  if (approved && !signer.timestampAuthority) content.push(band({ text: TRUSTED_TIME_WORDS.without, bold: true }, '#fff4d6', COLOURS.neutral));
  content.push(
    facts([
      ['Requirement (as entered)', { text: limitSentence(req), bold: true }],
      ['Standard and clause', req.reference || '— (not entered)'],
      ['Condition', req.condition || '— (not entered)'],
      ['Revision', `Revision ${revision.number}`],
      ['Status', { text: STATUS_WORDS[revision.status], bold: true, color: approved ? COLOURS.pass : COLOURS.fail }],
      ['Calculated result', VERDICT_WORDS[revision.results.verdict]],
      ['Author', `${revision.author.name} <${revision.author.email}>`],
      [
        approved ? 'Approved by' : 'Reviewer',
        reviewer ? `${reviewer.signerName ?? reviewer.reviewer.name} <${reviewer.reviewer.email}>` : '— (no review decision yet)',
      ],
      ['Created', timestamp(revision.createdAt)],
      ['Submitted for review', timestamp(revision.submittedAt)],
      ['Decided', timestamp(revision.decidedAt)],
      ['Revision content hash (SHA-256)', mono(revision.contentHash, 7.5)],
      ['Dossier generated', timestamp(model.generatedAt)],
      [
        'Trusted time',
        approved
          ? signer.timestampAuthority
            ? 'RFC 3161 signature timestamp (see the signature page)'
            : 'none — signed without a timestamp'
          : '— (applied when approved)',
      ],
    ]),
    cautionsBox(),
  );
  return content;
}

/** The cautions in full (docs/DOMAIN.md §6). */
function cautionsBox(): Content {
  return {
    table: {
      widths: ['*'],
      body: [
        [
          {
            stack: [
              { text: 'Cautions', bold: true, fontSize: 10, margin: [0, 0, 0, 3] },
              ...CAUTIONS.map((line): Content => ({ text: line, margin: [0, 0, 0, 2] })),
            ],
            fillColor: '#fdecea',
            margin: [8, 6, 8, 6],
          },
        ],
      ],
    },
    layout: { hLineColor: () => COLOURS.fail, vLineColor: () => COLOURS.fail, hLineWidth: () => 1, vLineWidth: () => 1 },
    margin: [0, 10, 0, 0],
    unbreakable: true,
  };
}

/** The first caution and where the rest stand, for the pages that show results. */
export function cautionLine(): Content {
  return band(
    { text: [{ text: `${CAUTIONS[0]} `, bold: true }, `${CAUTIONS[1]} ${CAUTIONS[3]} All cautions are on the cover.`], fontSize: 7.5 },
    '#fdecea',
    COLOURS.fail,
    [0, 0, 0, 6],
  );
}
