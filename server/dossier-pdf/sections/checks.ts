// Section 2: every check the results hold, calculated ones first, then the single-fault checks and the
// checks of each capture under its file name; the caution line on the same page as the first checks.
import type { Content } from 'pdfmake/interfaces';
import type { Check } from '../../../shared/schema/discharge';
import { groupChecks, isEvidenceCheck, type CheckWithEvidence } from '../checks-by-capture';
import { percent, quantity } from '../format';
import { caption, COLOURS, heading, keepWithHeadings, lead, subheading, swatch, traceColour } from '../layout';
import { inputLabel } from '../../../shared/design-fields';
import type { DossierPdfModel } from '../model';
import { checkVerdictWord, VERDICT_WORDS, type CheckWord } from '../wording';
import { cautionLine } from './cover';

const verdictColour = (word: CheckWord | string) =>
  word === 'PASS' ? COLOURS.pass : word === 'FAIL' ? COLOURS.fail : word === 'FOR INFORMATION' ? COLOURS.info : COLOURS.neutral;

function checkBlock(check: Check): Content {
  const word = checkVerdictWord(check);
  const info = check.limit === null;
  return {
    stack: [
      {
        text: [
          { text: word, bold: true, color: verdictColour(word) },
          { text: '   ' },
          { text: check.label, bold: true },
          ...(check.alternative ? [{ text: '   (alternative criterion)', color: COLOURS.muted, fontSize: 7.5 }] : []),
        ],
        margin: [0, 0, 0, 2],
      },
      {
        columns: [
          { text: [{ text: 'Value  ', color: COLOURS.muted }, quantity(check.value, check.unit)], width: '*' },
          {
            text: [{ text: 'Limit  ', color: COLOURS.muted }, info ? 'none (shown for information)' : quantity(check.limit, check.unit)],
            width: '*',
          },
          { text: [{ text: 'Margin  ', color: COLOURS.muted }, check.margin === null ? '—' : `${percent(check.margin)} of the limit`], width: '*' },
        ],
        margin: [12, 0, 0, 2],
      },
      { text: check.detail, margin: [12, 0, 0, 0], color: '#333333' },
    ],
    margin: [0, 4, 0, 6],
    unbreakable: true,
  };
}

export function checksSection(model: DossierPdfModel): Content[] {
  const results = model.revision.results;
  const groups = groupChecks(results.checks as CheckWithEvidence[], model.evidence, isEvidenceCheck);
  const content: Content[] = [
    heading('2  Checks', true),
    lead(cautionLine() as Exclude<Content, string | number | Content[]>),
    lead({ text: [{ text: 'Result: ', bold: true }, VERDICT_WORDS[results.verdict]], margin: [0, 0, 0, 4] }),
    caption(
      `Engine version ${results.engineVersion}. Margin is (limit − value) / limit: positive means inside the limit. A check without a limit is shown for information and decides nothing.`,
    ),
  ];
  if (results.missing.length) {
    content.push(lead({ text: 'Inputs still missing:', bold: true }), { ul: results.missing.map(inputLabel), margin: [0, 0, 0, 6] });
  }
  if (!results.checks.length) content.push({ text: 'No check could be computed.', italics: true });
  if (groups.calculated.length) content.push(subheading('Calculated checks', true), ...groups.calculated.map(checkBlock));
  if (groups.singleFault.length) {
    content.push(
      subheading('Single-fault checks', true),
      caption('One fault at a time in the discharge network (a bleeder string open, a series resistor shorted), as the requirement asks.'),
      ...groups.singleFault.map(checkBlock),
    );
  }
  if (groups.byCapture.length) content.push(subheading('Measured evidence checks', true));
  for (const group of groups.byCapture) {
    const index = model.evidence.filter((e) => e.analysis).findIndex((e) => e.sha256 === group.sha256);
    const entry = model.evidence.find((e) => e.sha256 === group.sha256);
    content.push(
      lead({
        columns: [
          ...(index >= 0 ? [swatch(traceColour(index))] : []),
          {
            text: [
              { text: entry ? entry.originalName : 'Capture not among this revision’s evidence', bold: true },
              entry ? { text: `   SHA-256 ${entry.sha256.slice(0, 16)}…`, color: COLOURS.muted, fontSize: 7.5 } : '',
            ],
            width: '*',
          },
        ],
        margin: [0, 4, 0, 0],
      }),
      ...group.checks.map(checkBlock),
    );
  }
  return keepWithHeadings(content);
}
