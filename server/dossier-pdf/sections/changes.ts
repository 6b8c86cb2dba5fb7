// Section 6: what changed since the revision this one was started from: inputs in engineering units,
// checks (each capture's checks under its file name), evidence files and the notes line by line.
import type { Content, TableCell } from 'pdfmake/interfaces';
import { captureOf, checkKind } from '../checks-by-capture';
import { percent, plain, quantity } from '../format';
import { COLOURS, grid, heading, keepWithHeadings, MONO, subheading } from '../layout';
import type { ChangedCheck, DossierPdfModel } from '../model';

function valueText(value: number | string | boolean | null, unit: string): string {
  if (value === null) return '—';
  // Tolerances, derating and drift are stored as fractions and read as percentages.
  if (typeof value === 'number' && unit === '%') return percent(value);
  if (typeof value === 'number') return quantity(value, unit);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return value;
}

/** A side of a changed check: absent, for information (no limit), or its verdict with the value. */
function sideText(pass: boolean | null, value: number | null, unit: string, informational: boolean): TableCell {
  if (pass === null) return { text: 'absent', color: COLOURS.muted };
  const word = informational ? 'for information' : pass ? 'PASS' : 'FAIL';
  return { text: `${word}  ${quantity(value, unit)}`, color: !informational && !pass ? COLOURS.fail : undefined };
}

function checkRows(model: DossierPdfModel, checks: readonly ChangedCheck[]): TableCell[][] {
  const own = new Map(model.revision.results.checks.map((c) => [c.id, c]));
  const files = [
    ...model.evidence.map((e) => ({ name: e.originalName, sha256: e.sha256 })),
    ...(model.diff?.evidenceRemoved ?? []).map((e) => ({ name: e.originalName, sha256: e.sha256 })),
  ];
  const captureName = (c: ChangedCheck) => {
    if (c.evidence) return c.evidence.name;
    const sha = captureOf(c, files);
    return sha ? (files.find((f) => f.sha256 === sha)?.name ?? null) : checkKind(c.id).startsWith('measured-') ? 'capture not named' : null;
  };
  const calculated = checks.filter((c) => captureName(c) === null);
  const byCapture = new Map<string, ChangedCheck[]>();
  for (const c of checks) {
    const name = captureName(c);
    if (name !== null) byCapture.set(name, [...(byCapture.get(name) ?? []), c]);
  }
  const row = (c: ChangedCheck, indent = 0): TableCell[] => {
    const unit = c.unit ?? own.get(c.id)?.unit ?? '';
    // A check without a limit now is for information on both sides.
    const informational = own.get(c.id)?.limit === null;
    return [
      { text: c.label, margin: [indent, 0, 0, 0] },
      sideText(c.fromPass, c.from, unit, informational),
      sideText(c.toPass, c.to, unit, informational),
    ];
  };
  return [
    ...calculated.map((c) => row(c)),
    ...[...byCapture.entries()].flatMap(([name, list]): TableCell[][] => [
      [{ text: `Capture: ${name}`, bold: true, colSpan: 3, fillColor: '#fafafa' }, {}, {}],
      ...list.map((c) => row(c, 8)),
    ]),
  ];
}

export function changesSection(model: DossierPdfModel): Content[] {
  const diff = model.diff;
  const content: Content[] = [heading(diff ? `6  Changes since revision ${diff.against.number}` : '6  Changes since the previous revision', true)];
  if (!diff) {
    content.push({ text: 'This revision was not started from an earlier one, so there is nothing to compare.', italics: true });
    return keepWithHeadings(content);
  }
  content.push(subheading('Inputs'));
  if (!diff.inputs.length) content.push({ text: 'No input changed.', italics: true });
  else {
    content.push(
      grid(
        ['Input', `Revision ${diff.against.number}`, `Revision ${model.revision.number}`, 'Change'],
        diff.inputs.map((c): TableCell[] => [
          c.label,
          valueText(c.from, c.unit),
          valueText(c.to, c.unit),
          { text: c.changePct === null ? '—' : `${c.changePct >= 0 ? '+' : '−'}${plain(Math.abs(c.changePct), 3)} %`, alignment: 'right' },
        ]),
        ['*', 95, 95, 55],
      ),
    );
  }
  content.push(subheading('Checks'));
  if (!diff.checks.length) content.push({ text: 'No check result changed.', italics: true });
  else
    content.push(
      grid(['Check', `Revision ${diff.against.number}`, `Revision ${model.revision.number}`], checkRows(model, diff.checks), ['*', 120, 120]),
    );
  content.push(subheading('Evidence'));
  if (!diff.evidenceAdded.length && !diff.evidenceRemoved.length) content.push({ text: 'The same evidence files as before.', italics: true });
  for (const [list, word, colour] of [
    [diff.evidenceAdded, 'Added', COLOURS.pass],
    [diff.evidenceRemoved, 'Removed', COLOURS.fail],
  ] as const) {
    for (const e of list) {
      content.push({
        text: [{ text: `${word}  `, bold: true, color: colour }, `${e.originalName}  `, { text: e.sha256, font: MONO, fontSize: 7 }],
        margin: [0, 0, 0, 2],
      });
    }
  }
  content.push(subheading('Notes'));
  if (!diff.notesDiff.trim()) content.push({ text: 'The notes did not change.', italics: true });
  else {
    content.push(
      ...diff.notesDiff
        .trimEnd()
        .split('\n')
        .map((line): Content => ({
          text: line || ' ',
          preserveLeadingSpaces: true,
          font: MONO,
          fontSize: 7.5,
          color: line.startsWith('+') ? COLOURS.pass : line.startsWith('-') ? COLOURS.fail : line.startsWith('@@') ? COLOURS.muted : '#222222',
        })),
    );
  }
  return keepWithHeadings(content);
}
