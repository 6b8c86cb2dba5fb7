// Section 5: every file with its SHA-256, then each capture: analysis and the notes on the probe and
// on referring the measurement to the requirement, marked with the colour of its line on the decay
// chart (one overlay of every capture, rather than a chart each: the plots dominate the build time).
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { Requirement } from '../../../shared/schema/discharge';
import type { WaveformAnalysis } from '../../../shared/schema/waveform';
import { captureOf, isEvidenceCheck, type CheckWithEvidence } from '../checks-by-capture';
import { bytes, plain, quantity, timestamp } from '../format';
import { caption, COLOURS, facts, heading, keepWithHeadings, MONO, splittable, subheading, swatch, traceColour } from '../layout';
import type { DossierPdfModel, EvidenceEntry } from '../model';
import { waveforms, type Analysed } from './chart';

const KIND_WORDS: Record<EvidenceEntry['kind'], string> = {
  waveform: 'Waveform',
  image: 'Image',
  datasheet: 'Datasheet',
  report: 'Report',
  other: 'Other',
};

const T0_SOURCE_WORDS: Record<WaveformAnalysis['t0Source'], string> = {
  option: 'entered by the user',
  marker: 'edge on the marker channel',
  detected: 'detected from the trace',
  start: 'start of the record (no disconnection found)',
};

const MANIFEST_WIDTHS: Array<number | '*'> = ['*', 72, 66, 106];

function manifest(model: DossierPdfModel): Content {
  // One table row per file, its hash on a second line inside the row, so a page never parts the two.
  const columns = (cells: Content[], bold = false): Content => ({
    columns: cells.map((cell, i) => ({ stack: [cell], width: MANIFEST_WIDTHS[i], bold: bold || undefined })),
    columnGap: 6,
  });
  return splittable({
    header: [
      { text: '#', bold: true, fillColor: COLOURS.band },
      { ...(columns(['File', 'Kind', 'Size', 'Uploaded'], true) as object), fillColor: COLOURS.band } as TableCell,
    ],
    rows: model.evidence.map((e, i): TableCell[] => [
      String(i + 1),
      {
        stack: [
          columns([
            { text: e.originalName, bold: true },
            `${KIND_WORDS[e.kind]}\n${e.mediaType}`,
            bytes(e.size).replace(' (', '\n('),
            `${e.uploadedBy.name}\n${timestamp(e.uploadedAt)}`,
          ]),
          {
            text: [
              { text: 'SHA-256  ', color: COLOURS.muted },
              { text: e.sha256, font: MONO },
            ],
            fontSize: 7.5,
            margin: [0, 2, 0, 0],
          },
        ],
      },
    ]),
    widths: [12, '*'],
    fontSize: 8,
  });
}

function fitText(a: WaveformAnalysis): string {
  const parts = [a.fit === 'good' ? 'good' : 'poor'];
  if (a.rSquared !== null) parts.push(`R² = ${plain(a.rSquared, 5)}`);
  if (a.residualRms !== null) parts.push(`residual ${quantity(a.residualRms, 'V', 3)} RMS`);
  if (a.offset !== null) parts.push(`offset B = ${quantity(a.offset, 'V', 3)}`);
  if (a.fitWindow !== null) parts.push(`window ${quantity(a.fitWindow.from, 's')} to ${quantity(a.fitWindow.to, 's')}`);
  return parts.join('; ');
}

function analysisFacts(a: WaveformAnalysis, req: Requirement): Content {
  const within = a.timeToSafe !== null && a.timeToSafe <= req.maxTime;
  return facts(
    [
      ['Channel analysed', a.channels.length > 1 ? `${a.channel} (of ${a.channels.join(', ')})` : a.channel || '—'],
      ['Samples used / skipped', `${a.samples.toLocaleString('en-GB')} / ${a.skipped.toLocaleString('en-GB')}`],
      ['Disconnection instant t0', `${quantity(a.t0, 's')} (${T0_SOURCE_WORDS[a.t0Source]})`],
      ['Voltage at t0', quantity(a.v0, 'V')],
      [
        'Measured time to the safe voltage',
        {
          text:
            a.timeToSafe === null
              ? `never below ${quantity(a.safeVoltage, 'V')} in the record`
              : `${quantity(a.timeToSafe, 's')} to ${quantity(a.safeVoltage, 'V')} (${within ? 'within' : 'beyond'} ${quantity(req.maxTime, 's')}, as measured)`,
          color: within ? COLOURS.pass : COLOURS.fail,
          bold: true,
        },
      ],
      [
        `Voltage at t0 + ${quantity(req.maxTime, 's')}`,
        a.vAtLimit === undefined ? '— (not analysed)' : a.vAtLimit === null ? '— (record ends earlier)' : quantity(a.vAtLimit, 'V'),
      ],
      ['Fitted time constant τ', a.tau === null ? '— (fit too poor to report)' : quantity(a.tau, 's')],
      ['Fit of V = A·e^(−(t−t0)/τ) + B', fitText(a)],
      ['Trace on the charts', `${a.trace.length.toLocaleString('en-GB')} points (minimum and maximum kept when decimated)`],
    ],
    170,
  );
}

/** One capture, kept on one page: its facts and notes read together. */
function captureBlock(model: DossierPdfModel, e: Analysed, index: number, checks: readonly CheckWithEvidence[]): Content {
  const req = model.dossier.requirement;
  const notes = [...e.analysis.notes, ...checks.map((c) => `${c.label}: ${c.detail}`)];
  const out: Content[] = [
    {
      columns: [
        swatch(traceColour(index)),
        {
          text: [
            { text: `Capture ${index + 1}: ${e.originalName}`, bold: true, fontSize: 9.5 },
            { text: '   its line on the decay chart (section 4) has this colour', color: COLOURS.muted, fontSize: 7.5 },
          ],
          width: '*',
        },
      ],
      margin: [0, 8, 0, 1],
    },
    {
      text: [
        { text: 'SHA-256  ', color: COLOURS.muted },
        { text: e.sha256, font: MONO },
      ],
      fontSize: 7.5,
      margin: [0, 0, 0, 3],
    },
    analysisFacts(e.analysis, req),
  ];
  if (e.analysis.safeVoltage !== req.safeVoltage) {
    out.push({
      text: `Analysed against ${quantity(e.analysis.safeVoltage, 'V')}, but the requirement says ${quantity(req.safeVoltage, 'V')}: re-analyse this capture.`,
      color: COLOURS.fail,
      bold: true,
    });
  }
  out.push(
    { text: 'Probe, referral and analysis notes', bold: true, margin: [0, 0, 0, 2] },
    notes.length ? { ul: notes, margin: [0, 0, 0, 6] } : { text: 'None.', italics: true, margin: [0, 0, 0, 6] },
  );
  return { stack: out, unbreakable: true, margin: [0, 0, 0, 8] };
}

export function evidenceSection(model: DossierPdfModel): Content[] {
  const content: Content[] = [heading('5  Evidence', true)];
  if (!model.evidence.length) {
    content.push({ text: 'No evidence is attached to this revision.', italics: true });
    return keepWithHeadings(content);
  }
  content.push(
    subheading('Files', true),
    caption('Each file is stored under its SHA-256; recompute the hash of the copy you hold to confirm it is the same file.'),
    manifest(model),
  );
  const analysed = waveforms(model);
  if (analysed.length) content.push(subheading('Waveform captures', true));
  const evidenceChecks = (model.revision.results.checks as CheckWithEvidence[]).filter(isEvidenceCheck);
  analysed.forEach((e, i) => {
    const own = evidenceChecks.filter((c) => captureOf(c, model.evidence) === e.sha256);
    content.push(captureBlock(model, e, i, own));
  });
  return keepWithHeadings(content);
}
