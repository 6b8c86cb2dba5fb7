// Section 4: the calculated decay with every capture overlaid, each capture in its own colour, and
// the instants the chart shows in numbers.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { WaveformAnalysis } from '../../../shared/schema/waveform';
import { decayChartSvg, type ChartSeries } from '../chart';
import { quantity } from '../format';
import { COLOURS, CONTENT_WIDTH, FONT, grid, heading, keepWithHeadings, traceColour } from '../layout';
import type { DossierPdfModel, EvidenceEntry } from '../model';

export type Analysed = EvidenceEntry & { analysis: WaveformAnalysis };

export function waveforms(model: DossierPdfModel): Analysed[] {
  return model.evidence.filter((e): e is Analysed => !!e.analysis);
}

/** Trace samples on the chart's time axis: seconds after the disconnection instant t0. */
function measuredPoints(analysis: WaveformAnalysis) {
  const t0 = analysis.t0 ?? 0;
  return analysis.trace.map((p) => ({ t: p.t - t0, v: p.v }));
}

/** The calculated curves, and every capture in the colour of its place among the captures. */
function chartSeries(model: DossierPdfModel): ChartSeries[] {
  const { results } = model.revision;
  const captures = waveforms(model);
  const series: ChartSeries[] = [];
  if (results.curve.length) {
    series.push(
      { label: 'Nominal (calculated)', kind: 'model', color: COLOURS.nominal, width: 1.2, points: results.curve.map((p) => ({ t: p.t, v: p.v })) },
      {
        label: 'Worst case (calculated)',
        kind: 'model',
        color: COLOURS.worst,
        width: 1.4,
        dash: '6 2',
        points: results.curve.map((p) => ({ t: p.t, v: p.vWorst })),
      },
    );
  }
  for (const e of captures) {
    series.push({
      label: `Measured: ${e.originalName}`,
      kind: 'measured',
      color: traceColour(captures.indexOf(e)),
      width: 1,
      points: measuredPoints(e.analysis),
    });
  }
  return series;
}

function chartSvg(model: DossierPdfModel, series: ChartSeries[], height: number): Content {
  const req = model.dossier.requirement;
  return {
    svg: decayChartSvg({ series, safeVoltage: req.safeVoltage, maxTime: req.maxTime, width: CONTENT_WIDTH, height, fontFamily: FONT }),
    width: CONTENT_WIDTH,
  };
}

export function chartSection(model: DossierPdfModel): Content[] {
  const series = chartSeries(model);
  if (!series.length) {
    return keepWithHeadings([
      heading('4  Decay chart'),
      { text: 'No curve: the design inputs are incomplete and no waveform was attached.', italics: true },
    ]);
  }
  return [
    {
      // Heading, caption, chart and its table stay on one page.
      stack: [
        { text: '4  Decay chart', style: 'h1', tocItem: true, tocMargin: [0, 3, 0, 0] },
        {
          text: 'Calculated decay, nominal (from the nominal bus voltage) and worst case (from the maximum bus voltage), with the measured waveforms overlaid, each in its own colour; each waveform’s time counts from its own disconnection instant. Dashed green: the safe voltage; dotted grey: the time limit.',
          color: COLOURS.muted,
          fontSize: 8,
          margin: [0, 0, 0, 6],
        },
        chartSvg(model, series, 300 + 11 * series.length),
        instantsTable(model),
      ],
      unbreakable: true,
    } as Content,
  ];
}

/** What the chart shows, in numbers: where each curve starts and when it reaches the safe level. */
function instantsTable(model: DossierPdfModel): Content {
  const { nominal, worstCase } = model.revision.results;
  const limit = model.dossier.requirement.maxTime;
  const verdict = (t: number | null): TableCell =>
    t === null
      ? { text: 'not reached', color: COLOURS.fail }
      : { text: t <= limit ? 'within the limit' : 'beyond the limit', color: t <= limit ? COLOURS.pass : COLOURS.fail };
  const rows: TableCell[][] = [];
  for (const [label, state] of [
    ['Nominal (calculated)', nominal],
    ['Worst case (calculated)', worstCase],
  ] as const) {
    if (state)
      rows.push([
        label,
        quantity(state.initialVoltage, 'V'),
        `${quantity(state.timeToSafe, 's')} (to ${quantity(state.safeThreshold, 'V')})`,
        verdict(state.timeToSafe),
      ]);
  }
  waveforms(model).forEach((e, i) => {
    const a = e.analysis;
    rows.push([
      { text: `Measured: ${e.originalName}`, color: traceColour(i) },
      quantity(a.v0, 'V'),
      a.timeToSafe === null ? '—' : `${quantity(a.timeToSafe, 's')} (to ${quantity(a.safeVoltage, 'V')})`,
      verdict(a.timeToSafe),
    ]);
  });
  return {
    stack: [grid(['Curve', 'Starts at', 'Reaches the safe level after', `Against ${quantity(limit, 's')}`], rows, ['*', 60, 140, 80])],
    margin: [0, 8, 0, 0],
  };
}
