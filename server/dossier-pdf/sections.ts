// The dossier's sections as pdfmake content. Each function builds fresh objects: pdfmake writes layout
// state into the definition it is given, so nothing here may be shared between two documents.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { Check, DesignDraft, NetworkState, Requirement } from '../../shared/schema/discharge';
import type { SnubberDraft } from '../../shared/schema/snubber';
import type { WaveformAnalysis } from '../../shared/schema/waveform';
import { decayChartSvg, type ChartSeries } from './chart';
import { bytes, percent, plain, quantity, timestamp } from './format';
import { approvalOf, decisionsOnRevision, type DossierPdfModel, type EvidenceEntry } from './model';
import {
  CAUTIONS,
  checkVerdictWord,
  DECISION_WORDS,
  DEVELOPMENT_MARK,
  NOT_APPROVED_MARK,
  STATUS_WORDS,
  VERDICT_WORDS,
} from './wording';

export const FONT = 'DejaVuSans';
export const MONO = 'DejaVuSansMono';
/** Printable width of an A4 page with the dossier's 40 pt side margins. */
export const CONTENT_WIDTH = 595.28 - 80;

const COLOURS = {
  pass: '#1b5e20',
  fail: '#b71c1c',
  neutral: '#7a5a00',
  muted: '#5f6368',
  rule: '#c8c8c8',
  band: '#f3f4f6',
  nominal: '#1f4e9c',
  worst: '#c62828',
  traces: ['#7b1fa2', '#00838f', '#6d4c41', '#ef6c00', '#2e7d32'],
};

const verdictColour = (word: string) => (word === 'PASS' ? COLOURS.pass : word === 'FAIL' ? COLOURS.fail : COLOURS.neutral);

const mono = (text: string, fontSize = 8): Content => ({ text, font: MONO, fontSize });

// Headings and the captions under them are "leads": keepWithHeadings glues them to the block they
// introduce, so none is left at the foot of a page. Doing it in the definition keeps pdfmake to one
// layout pass; its pageBreakBefore hook relayouts the whole document for every heading it moves.
const LEADS = new WeakSet<object>();
type Block = Exclude<Content, string | number | Content[]>;
function lead(item: Block): Block {
  LEADS.add(item);
  return item;
}

/** Leads that start a new page; the break goes on the glued block, since a break inside it is ignored. */
const NEW_PAGE = new WeakSet<object>();

function heading(text: string, newPage = false): Content {
  const node = lead({ text, style: 'h1' });
  if (newPage) NEW_PAGE.add(node);
  return node;
}

const subheading = (text: string): Content => lead({ text, style: 'h2' });

const caption = (text: string): Content => lead({ text, color: COLOURS.muted, fontSize: 8, margin: [0, 0, 0, 4] });

/** Hairlines between rows only: the table reads as a list of facts, not as a grid. */
const RULED = {
  hLineWidth: (i: number, node: { table: { body: unknown[] } }) => (i === 0 || i === node.table.body.length ? 0 : 0.5),
  vLineWidth: () => 0,
  hLineColor: () => COLOURS.rule,
  paddingLeft: (i: number) => (i === 0 ? 0 : 6),
  paddingRight: () => 4,
  paddingTop: () => 2.5,
  paddingBottom: () => 2.5,
};

/** As RULED, with a darker rule under the header row. */
const HEADED = {
  ...RULED,
  hLineWidth: (i: number, node: { table: { body: unknown[] } }) => (i === 0 || i === node.table.body.length ? 0 : i === 1 ? 0.8 : 0.5),
  hLineColor: (i: number) => (i === 1 ? '#888888' : COLOURS.rule),
  paddingLeft: () => 4,
};

/** The rest of a split table: its top rule continues the part above; no header row. */
const CONTINUED = {
  ...HEADED,
  hLineWidth: (i: number, node: { table: { body: unknown[] } }) => (i === node.table.body.length ? 0 : 0.5),
  hLineColor: () => COLOURS.rule,
};

/** A table that may be split after a few rows when it follows a heading. */
interface TableSpec {
  header: TableCell[];
  rows: TableCell[][];
  widths: Array<number | string>;
  fontSize?: number;
}
const TABLES = new WeakMap<object, TableSpec>();
/** A table up to this many rows moves whole with its heading; a longer one takes only its first rows along. */
const KEEP_WHOLE_ROWS = 12;
const LEAD_ROWS = 4;

function tablePart(spec: TableSpec, from: number, to: number): Content {
  const first = from === 0;
  return {
    table: {
      headerRows: first ? 1 : 0,
      dontBreakRows: true,
      widths: spec.widths,
      body: [...(first ? [spec.header] : []), ...spec.rows.slice(from, to)],
    },
    layout: first ? HEADED : CONTINUED,
    ...(spec.fontSize ? { fontSize: spec.fontSize } : {}),
    margin: [0, first ? 2 : 0, 0, to >= spec.rows.length ? 8 : 0],
  };
}

function splittable(spec: TableSpec): Content {
  const node = tablePart(spec, 0, spec.rows.length);
  TABLES.set(node as object, spec);
  return node;
}

/** Glues every run of leads to the block after it; a long table gives only its first rows to the glue. */
function keepWithHeadings(items: readonly Content[]): Content[] {
  const out: Content[] = [];
  let leads: Content[] = [];
  for (const item of items) {
    if (typeof item === 'object' && LEADS.has(item)) {
      leads.push(item);
      continue;
    }
    if (!leads.length) {
      out.push(item);
      continue;
    }
    const pageBreak = leads.some((l) => typeof l === 'object' && NEW_PAGE.has(l)) ? { pageBreak: 'before' as const } : {};
    const spec = typeof item === 'object' ? TABLES.get(item) : undefined;
    if (spec && spec.rows.length > KEEP_WHOLE_ROWS) {
      out.push(
        { stack: [...leads, tablePart(spec, 0, LEAD_ROWS)], unbreakable: true, ...pageBreak },
        tablePart(spec, LEAD_ROWS, spec.rows.length),
      );
    } else {
      out.push({ stack: [...leads, item], unbreakable: true, ...pageBreak });
    }
    leads = [];
  }
  if (leads.length) out.push({ stack: leads });
  return out;
}

/** Text split into one block per line, so a heading need only take the first line along. */
const lines = (text: string, style: (line: string) => Record<string, unknown> = () => ({})): Content[] =>
  text.split('\n').map((line): Content => ({ text: line || ' ', preserveLeadingSpaces: true, ...style(line) }));

/** Two-column label/value table with light rules. */
function facts(rows: Array<[string, Content]>, labelWidth = 150): Content {
  return {
    table: {
      widths: [labelWidth, '*'],
      body: rows.map(([label, value]): TableCell[] => [{ text: label, color: COLOURS.muted }, value as TableCell]),
    },
    layout: RULED,
    margin: [0, 2, 0, 8],
  };
}

const headerRow = (titles: string[]): TableCell[] => titles.map((h): TableCell => ({ text: h, bold: true, fillColor: COLOURS.band }));

function grid(header: string[], rows: TableCell[][], widths: Array<number | string>): Content {
  return splittable({ header: headerRow(header), rows, widths });
}

function limitSentence(req: Requirement): string {
  const parts = [`voltage at or below ${quantity(req.safeVoltage, 'V')} within ${quantity(req.maxTime, 's')}`];
  if (req.maxEnergy != null) parts.push(`or stored energy at most ${quantity(req.maxEnergy, 'J')}`);
  if (req.maxCharge != null) parts.push(`or stored charge at most ${quantity(req.maxCharge, 'C')}`);
  let sentence = parts.join(', ');
  if (req.fallbackMaxTime != null) sentence += `; passive bleeders alone within ${quantity(req.fallbackMaxTime, 's')}`;
  return sentence;
}

// ---------------------------------------------------------------------------------------------------

export function cover(model: DossierPdfModel): Content[] {
  const { revision, dossier, product } = model;
  const req = dossier.requirement;
  const approval = approvalOf(model);
  const decisions = decisionsOnRevision(model);
  const latestReview = decisions.length ? decisions[decisions.length - 1] : null;
  const approved = revision.status === 'approved';
  const reviewer = approved && approval ? approval : latestReview;

  const content: Content[] = [
    { text: model.organisation, color: COLOURS.muted, fontSize: 10, margin: [0, 0, 0, 14] },
    { text: 'Capacitor discharge compliance dossier', fontSize: 11, color: COLOURS.muted },
    { text: dossier.title, style: 'title', margin: [0, 2, 0, 4] },
    { text: `${product.name} — model ${product.modelNumber}`, fontSize: 12, bold: true },
    ...(product.description ? [{ text: product.description, color: COLOURS.muted, margin: [0, 2, 0, 0] } as Content] : []),
    {
      table: {
        widths: ['*'],
        body: [
          [
            {
              text: approved ? 'Approved — digitally signed' : NOT_APPROVED_MARK,
              bold: true,
              fontSize: 12,
              color: '#ffffff',
              fillColor: approved ? COLOURS.pass : COLOURS.fail,
              margin: [6, 5, 6, 5],
            },
          ],
        ],
      },
      layout: 'noBorders',
      margin: [0, 12, 0, 4],
    },
  ];
  if (model.signer.kind === 'development') {
    content.push({
      table: {
        widths: ['*'],
        body: [
          [
            {
              stack: [
                { text: DEVELOPMENT_MARK, bold: true },
                {
                  text: approved
                    ? 'Signed with a self-signed certificate that this installation generated for development; it identifies no organisation.'
                    : 'This installation signs approved dossiers with a self-signed development certificate; it identifies no organisation.',
                  fontSize: 8,
                },
              ],
              color: COLOURS.neutral,
              fillColor: '#fff4d6',
              margin: [6, 4, 6, 4],
            },
          ],
        ],
      },
      layout: 'noBorders',
      margin: [0, 0, 0, 4],
    });
  }
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
        reviewer ? `${reviewer.reviewer.name} <${reviewer.reviewer.email}>` : '— (no review decision yet)',
      ],
      ['Created', timestamp(revision.createdAt)],
      ['Submitted for review', timestamp(revision.submittedAt)],
      ['Decided', timestamp(revision.decidedAt)],
      ['Revision content hash (SHA-256)', mono(revision.contentHash, 7.5)],
      ['Dossier generated', timestamp(model.generatedAt)],
    ]),
    cautionsBox(),
  );
  return content;
}

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

// ---------------------------------------------------------------------------------------------------

type Row = [string, string];

const given = (value: number | null | undefined, unit: string): string =>
  value === null || value === undefined ? '— (not entered)' : quantity(value, unit);
const givenPct = (value: number | null | undefined): string =>
  value === null || value === undefined ? '— (not entered)' : percent(value);
const givenCount = (value: number | null | undefined): string =>
  value === null || value === undefined ? '— (not entered)' : String(value);
const givenTemp = (value: number | null | undefined): string =>
  value === null || value === undefined ? '— (not entered)' : `${plain(value)} °C`;

function designRows(design: DesignDraft): Array<{ title: string; rows: Row[] }> {
  const groups: Array<{ title: string; rows: Row[] }> = [];
  const bus = design.bus;
  groups.push({
    title: 'DC bus',
    rows: [
      ['Nominal bus voltage', given(bus?.nominalVoltage, 'V')],
      ['Maximum bus voltage (initial voltage of the worst case)', given(bus?.maxVoltage, 'V')],
    ],
  });
  const c = design.capacitors;
  groups.push({
    title: 'Capacitor bank',
    rows: [
      ['Capacitance per unit', given(c?.capacitance, 'F')],
      ['Units in series', givenCount(c?.series)],
      ['Strings in parallel', givenCount(c?.parallel)],
      ['Tolerance (−)', givenPct(c?.toleranceMinus)],
      ['Tolerance (+)', givenPct(c?.tolerancePlus)],
      ['Ageing loss', c?.ageing == null ? '— (none entered)' : percent(c.ageing)],
    ],
  });
  const b = design.bleeder;
  groups.push({
    title: 'Bleeder network',
    rows: [
      ['Resistance per resistor', given(b?.resistance, 'Ω')],
      ['Resistors in series per string', givenCount(b?.series)],
      ['Strings in parallel', givenCount(b?.parallel)],
      ['Tolerance', givenPct(b?.tolerance)],
      ['Temperature coefficient', b?.tcrPpmPerK == null ? '— (not entered)' : `${plain(b.tcrPpmPerK)} ppm/K`],
      ['Life drift', givenPct(b?.drift)],
      ['Power rating per resistor', given(b?.powerRating, 'W')],
      ['Limiting element voltage', given(b?.elementVoltage, 'V')],
      ['Derating (share of the rating allowed)', givenPct(b?.derating)],
    ],
  });
  const a = design.ambient;
  groups.push({
    title: 'Ambient temperature',
    rows: [
      ['Minimum', givenTemp(a?.min)],
      ['Maximum', givenTemp(a?.max)],
    ],
  });
  const act = design.active;
  if (!act) {
    groups.push({ title: 'Active discharge', rows: [['Circuit', 'None declared (passive bleeders only)']] });
  } else if (act.mode === 'constant-current') {
    groups.push({
      title: 'Active discharge',
      rows: [
        ['Circuit', 'Constant current'],
        ['Discharge current', given(act.current, 'A')],
        ['Activation delay', given(act.delay, 's')],
      ],
    });
  } else {
    groups.push({
      title: 'Active discharge',
      rows: [
        ['Circuit', 'Switched resistor'],
        ['Discharge resistance', given(act.resistance, 'Ω')],
        ['Pulse energy rating', given(act.pulseEnergy, 'J')],
        ['Pulse power rating', act.powerRating == null ? '— (none entered)' : quantity(act.powerRating, 'W')],
        ['Activation delay', given(act.delay, 's')],
      ],
    });
  }
  if (design.balancing) {
    groups.push({
      title: 'Balancing of series capacitors',
      rows: [
        ['Maximum capacitor leakage current', given(design.balancing.leakageCurrent, 'A')],
        ['Capacitor voltage rating', given(design.balancing.capacitorVoltageRating, 'V')],
      ],
    });
  }
  for (const [i, s] of (design.snubbers ?? []).entries()) groups.push({ title: `Snubber: ${s.name || `#${i + 1} (unnamed)`}`, rows: snubberRows(s) });
  return groups;
}

const SNUBBER_KIND_WORDS: Record<SnubberDraft['kind'], string> = {
  rc: 'RC damping',
  'rcd-turnoff': 'RCD turn-off',
  'rcd-clamp': 'RCD clamp',
};

function snubberRows(s: SnubberDraft): Row[] {
  const rows: Row[] = [
    ['Kind', SNUBBER_KIND_WORDS[s.kind]],
    ['Location', s.location || '—'],
    ['Resistance', given(s.resistance, 'Ω')],
    ['Capacitance', `${given(s.capacitance, 'F')} ± ${givenPct(s.capacitanceTolerance)}`],
    ['Resistor power rating', `${given(s.powerRating, 'W')} (derating ${givenPct(s.derating)})`],
    ['Capacitor voltage rating', given(s.capacitorVoltageRating, 'V')],
    ['Switching voltage', `${given(s.switchingVoltage, 'V')} (overshoot ${givenPct(s.overshoot)})`],
    ['Switching frequency', given(s.switchingFrequency, 'Hz')],
    ['Accessible', s.accessible ? 'Yes' : 'No'],
  ];
  const extras: Array<[string, number | null | undefined, string]> =
    s.kind === 'rc'
      ? [['Parasitic inductance', s.parasiticInductance, 'H'], ['Parasitic capacitance', s.parasiticCapacitance, 'F']]
      : s.kind === 'rcd-turnoff'
        ? [['Switched current', s.switchedCurrent, 'A'], ['Current fall time', s.fallTime, 's'], ['Minimum on-time', s.minOnTime, 's']]
        : [['Leakage inductance', s.leakageInductance, 'H'], ['Peak primary current', s.peakCurrent, 'A'], ['Clamp voltage', s.clampVoltage, 'V'], ['Reflected voltage', s.reflectedVoltage, 'V']];
  for (const [label, value, unit] of extras) if (value != null) rows.push([label, quantity(value, unit)]);
  return rows;
}

export function inputsSection(model: DossierPdfModel): Content[] {
  const req = model.dossier.requirement;
  const content: Content[] = [
    heading('1  Requirement and design inputs', true),
    subheading('Requirement, as entered by the user'),
    facts([
      ['Safe voltage', quantity(req.safeVoltage, 'V')],
      ['Time limit', quantity(req.maxTime, 's')],
      ['Energy limit', req.maxEnergy == null ? '— (none)' : quantity(req.maxEnergy, 'J')],
      ['Charge limit', req.maxCharge == null ? '— (none)' : quantity(req.maxCharge, 'C')],
      ['Passive fallback time limit', req.fallbackMaxTime == null ? '— (none)' : quantity(req.fallbackMaxTime, 's')],
      ['Condition', req.condition || '— (not entered)'],
      ['Standard and clause', req.reference || '— (not entered)'],
    ], 190),
    subheading('Design inputs'),
  ];
  for (const group of designRows(model.revision.design)) {
    content.push({
      unbreakable: true,
      table: {
        headerRows: 1,
        dontBreakRows: true,
        widths: [250, '*'],
        body: [
          [{ text: group.title, bold: true, colSpan: 2, fillColor: COLOURS.band }, {}],
          ...group.rows.map(([label, value]): TableCell[] => [{ text: label, color: COLOURS.muted }, value]),
        ],
      },
      layout: HEADED,
      margin: [0, 0, 0, 6],
    });
  }
  if (model.revision.notes.trim()) content.push(subheading('Engineer’s notes'), ...lines(model.revision.notes.trimEnd()));
  return keepWithHeadings(content);
}

// ---------------------------------------------------------------------------------------------------

function checkBlock(check: Check): Content {
  const word = checkVerdictWord(check);
  const margin = check.margin === null ? '—' : `${percent(check.margin)} of the limit`;
  return {
    stack: [
      {
        text: [
          { text: word, bold: true, color: verdictColour(word) },
          { text: '   ' },
          { text: check.label, bold: true },
          { text: `   (${check.id}${check.alternative ? ', alternative criterion' : ''})`, color: COLOURS.muted, fontSize: 7.5 },
        ],
        margin: [0, 0, 0, 2],
      },
      {
        columns: [
          { text: [{ text: 'Value  ', color: COLOURS.muted }, quantity(check.value, check.unit)], width: '*' },
          { text: [{ text: 'Limit  ', color: COLOURS.muted }, quantity(check.limit, check.unit)], width: '*' },
          { text: [{ text: 'Margin  ', color: COLOURS.muted }, margin], width: '*' },
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
  const content: Content[] = [
    heading('2  Checks'),
    lead({ text: [{ text: 'Result: ', bold: true }, VERDICT_WORDS[results.verdict]], margin: [0, 0, 0, 4] }),
    caption(`Engine version ${results.engineVersion}. Margin is (limit − value) / limit: positive means inside the limit.`),
  ];
  if (results.missing.length) {
    content.push(lead({ text: 'Inputs still missing:', bold: true }), { ul: results.missing.map((m) => mono(m)), margin: [0, 0, 0, 6] });
  }
  if (!results.checks.length) content.push({ text: 'No check could be computed.', italics: true });
  for (const check of results.checks) content.push(checkBlock(check));
  return keepWithHeadings(content);
}

// ---------------------------------------------------------------------------------------------------

const NETWORK_ROWS: Array<{ key: keyof NetworkState; label: string; unit: string }> = [
  { key: 'resistance', label: 'Network resistance (total)', unit: 'Ω' },
  { key: 'capacitance', label: 'Network capacitance (total)', unit: 'F' },
  { key: 'initialVoltage', label: 'Initial voltage', unit: 'V' },
  { key: 'tau', label: 'Time constant τ of the passive network', unit: 's' },
  { key: 'safeThreshold', label: 'Voltage at which the earliest criterion is met', unit: 'V' },
  { key: 'timeToSafe', label: 'Time to safe (declared discharge path)', unit: 's' },
  { key: 'passiveTimeToSafe', label: 'Time to safe (passive bleeders alone)', unit: 's' },
];

export function worstCaseSection(model: DossierPdfModel): Content[] {
  const { nominal, worstCase, sensitivity } = model.revision.results;
  const content: Content[] = [heading('3  Worst case and sensitivity')];
  if (!nominal || !worstCase) {
    content.push({ text: 'Not computed: the design inputs are incomplete.', italics: true });
  } else {
    content.push(
      caption('Worst case is the slowest discharge: highest resistance and capacitance within tolerance, temperature and drift, from the maximum bus voltage.'),
      grid(
        ['Quantity', 'Nominal', 'Worst case'],
        NETWORK_ROWS.map((r): TableCell[] => [r.label, quantity(nominal[r.key], r.unit), { text: quantity(worstCase[r.key], r.unit), bold: true }]),
        ['*', 110, 110],
      ),
    );
  }
  content.push(subheading('Sensitivity'));
  if (!sensitivity || !sensitivity.entries.length) {
    content.push({ text: 'Not computed.', italics: true });
  } else {
    const entries = [...sensitivity.entries].sort((p, q) => Math.abs(q.percentPerPercent) - Math.abs(p.percentPerPercent));
    content.push(
      caption(`Change of ${sensitivity.of} in percent for a +1 % change of each input; the largest first.`),
      grid(
        ['Input', '% per +1 %'],
        entries.map((e): TableCell[] => [e.label, { text: `${e.percentPerPercent >= 0 ? '+' : '−'}${plain(Math.abs(e.percentPerPercent), 3)} %`, alignment: 'right' }]),
        ['*', 90],
      ),
    );
  }
  return keepWithHeadings(content);
}

// ---------------------------------------------------------------------------------------------------

function waveforms(model: DossierPdfModel): Analysed[] {
  return model.evidence.filter((e): e is Analysed => !!e.analysis);
}

export function chartSection(model: DossierPdfModel): Content[] {
  const { results } = model.revision;
  const req = model.dossier.requirement;
  const series: ChartSeries[] = [];
  if (results.curve.length) {
    series.push(
      { label: 'Nominal (calculated)', kind: 'model', color: COLOURS.nominal, width: 1.4, points: results.curve.map((p) => ({ t: p.t, v: p.v })) },
      { label: 'Worst case (calculated)', kind: 'model', color: COLOURS.worst, width: 1.6, dash: '6 2', points: results.curve.map((p) => ({ t: p.t, v: p.vWorst })) },
    );
  }
  waveforms(model).forEach((e, i) => {
    series.push({
      label: `Measured: ${e.originalName}`,
      kind: 'measured',
      color: COLOURS.traces[i % COLOURS.traces.length],
      width: 0.8,
      points: measuredPoints(e.analysis),
    });
  });
  if (!series.length) {
    return keepWithHeadings([heading('4  Decay chart'), { text: 'No curve: the design inputs are incomplete and no waveform was attached.', italics: true }]);
  }
  return [
    {
      // Heading, caption and chart stay on one page.
      stack: [
        { text: '4  Decay chart', style: 'h1' },
        {
          text: 'Calculated decay, nominal (from the nominal bus voltage) and worst case (from the maximum bus voltage), with the measured waveforms overlaid; each waveform’s time counts from its own disconnection instant. Dashed green: the safe voltage; dashed grey: the time limit.',
          color: COLOURS.muted,
          fontSize: 8,
          margin: [0, 0, 0, 6],
        },
        {
          svg: decayChartSvg({ series, safeVoltage: req.safeVoltage, maxTime: req.maxTime, width: CONTENT_WIDTH, height: 340, fontFamily: FONT }),
          width: CONTENT_WIDTH,
        },
      ],
      unbreakable: true,
    },
    instantsTable(model),
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
  for (const [label, state] of [['Nominal (calculated)', nominal], ['Worst case (calculated)', worstCase]] as const) {
    if (state) rows.push([label, quantity(state.initialVoltage, 'V'), `${quantity(state.timeToSafe, 's')} (to ${quantity(state.safeThreshold, 'V')})`, verdict(state.timeToSafe)]);
  }
  for (const e of waveforms(model)) {
    const a = e.analysis;
    rows.push([`Measured: ${e.originalName}`, quantity(a.v0, 'V'), a.timeToSafe === null ? '—' : `${quantity(a.timeToSafe, 's')} (to ${quantity(a.safeVoltage, 'V')})`, verdict(a.timeToSafe)]);
  }
  return {
    stack: [
      grid(['Curve', 'Starts at', 'Reaches the safe level after', `Against ${quantity(limit, 's')}`], rows, ['*', 60, 140, 80]),
    ],
    margin: [0, 8, 0, 0],
  };
}

/** Trace samples on the chart's time axis: seconds after the disconnection instant t0. */
function measuredPoints(analysis: WaveformAnalysis) {
  const t0 = analysis.t0 ?? 0;
  return analysis.trace.map((p) => ({ t: p.t - t0, v: p.v }));
}

// ---------------------------------------------------------------------------------------------------

const KIND_WORDS: Record<EvidenceEntry['kind'], string> = {
  waveform: 'Waveform',
  image: 'Image',
  datasheet: 'Datasheet',
  report: 'Report',
  other: 'Other',
};

export function evidenceSection(model: DossierPdfModel): Content[] {
  const content: Content[] = [heading('5  Evidence')];
  if (!model.evidence.length) {
    content.push({ text: 'No evidence is attached to this revision.', italics: true });
    return keepWithHeadings(content);
  }
  content.push(caption('Each file is stored under its SHA-256; recompute the hash of the copy you hold to confirm it is the same file.'));
  // One table row per file, its hash on a second line inside the row, so a page never parts the two.
  const columns = (cells: Content[], bold = false): Content => ({
    columns: cells.map((cell, i) => ({ stack: [cell], width: MANIFEST_WIDTHS[i], bold: bold || undefined })),
    columnGap: 6,
  });
  content.push(
    splittable({
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
            { text: [{ text: 'SHA-256  ', color: COLOURS.muted }, { text: e.sha256, font: MONO }], fontSize: 7.5, margin: [0, 2, 0, 0] },
          ],
        },
      ]),
      widths: [12, '*'],
      fontSize: 8,
    }),
  );

  const analysed = waveforms(model);
  if (analysed.length) content.push(subheading('Waveform analyses'));
  for (let i = 0; i < analysed.length; i += 3) content.push(analysisTable(analysed.slice(i, i + 3), model.dossier.requirement));
  if (analysed.length) {
    content.push({
      text: 'Traces are decimated (minimum and maximum kept) for plotting; each analysis used every sample of its file.',
      color: COLOURS.muted,
      fontSize: 7.5,
    });
  }
  return keepWithHeadings(content);
}

const MANIFEST_WIDTHS: Array<number | '*'> = ['*', 72, 66, 106];

const T0_SOURCE_WORDS: Record<WaveformAnalysis['t0Source'], string> = {
  option: 'entered by the user',
  marker: 'edge on the marker channel',
  detected: 'detected from the trace',
  start: 'start of the record (no disconnection found)',
};

type Analysed = EvidenceEntry & { analysis: WaveformAnalysis };

function fitText(a: WaveformAnalysis): string {
  const parts = [a.fit === 'good' ? 'good' : 'poor'];
  if (a.rSquared !== null) parts.push(`R² = ${plain(a.rSquared, 5)}`);
  if (a.residualRms !== null) parts.push(`residual ${quantity(a.residualRms, 'V', 3)} RMS`);
  if (a.offset !== null) parts.push(`offset B = ${quantity(a.offset, 'V', 3)}`);
  if (a.fitWindow !== null) parts.push(`window ${quantity(a.fitWindow.from, 's')} to ${quantity(a.fitWindow.to, 's')}`);
  return parts.join('; ');
}

/** Up to three captures side by side, one column each, so the units of a lot can be compared across. */
function analysisTable(group: readonly Analysed[], req: Requirement): Content {
  const row = (label: string, cell: (a: WaveformAnalysis) => TableCell): TableCell[] => [
    { text: label, color: COLOURS.muted },
    ...group.map((e) => cell(e.analysis)),
    ...Array.from({ length: 3 - group.length }, (): TableCell => ''),
  ];
  const body: TableCell[][] = [
    [{ text: 'Capture', bold: true, fillColor: COLOURS.band }, ...group.map((e): TableCell => ({ text: e.originalName, bold: true, fillColor: COLOURS.band })), ...Array.from({ length: 3 - group.length }, (): TableCell => ({ text: '', fillColor: COLOURS.band }))],
    row('Channel analysed', (a) => (a.channels.length > 1 ? `${a.channel} (of ${a.channels.join(', ')})` : a.channel || '—')),
    row('Samples used / skipped', (a) => `${a.samples.toLocaleString('en-GB')} / ${a.skipped.toLocaleString('en-GB')}`),
    row('Disconnection instant t0', (a) => `${quantity(a.t0, 's')} (${T0_SOURCE_WORDS[a.t0Source]})`),
    row('Voltage at t0', (a) => quantity(a.v0, 'V')),
    row(`Measured time to the safe voltage`, (a) => {
      const within = a.timeToSafe !== null && a.timeToSafe <= req.maxTime;
      return {
        text: a.timeToSafe === null ? `never below ${quantity(a.safeVoltage, 'V')} in the record` : `${quantity(a.timeToSafe, 's')} to ${quantity(a.safeVoltage, 'V')} (${within ? 'within' : 'beyond'} ${quantity(req.maxTime, 's')})`,
        color: within ? COLOURS.pass : COLOURS.fail,
        bold: true,
      };
    }),
    row(`Voltage at t0 + ${quantity(req.maxTime, 's')}`, (a) => (a.vAtLimit === undefined ? '— (not analysed)' : a.vAtLimit === null ? '— (record ends earlier)' : quantity(a.vAtLimit, 'V'))),
    row('Fitted time constant τ', (a) => (a.tau === null ? '— (fit too poor to report)' : quantity(a.tau, 's'))),
    row('Fit of V = A·e^(−(t−t0)/τ) + B', fitText),
    row('Trace on the chart', (a) => `${a.trace.length.toLocaleString('en-GB')} points`),
    row('Remarks', (a) => (a.notes.length ? { ul: [...a.notes] } : '—')),
  ];
  const mismatched = group.filter((e) => e.analysis.safeVoltage !== req.safeVoltage);
  return {
    stack: [
      {
        table: { headerRows: 1, dontBreakRows: true, widths: [105, '*', '*', '*'], body },
        layout: HEADED,
        fontSize: 7.5,
      },
      ...mismatched.map((e): Content => ({
        text: `${e.originalName} was analysed against ${quantity(e.analysis.safeVoltage, 'V')}, but the requirement says ${quantity(req.safeVoltage, 'V')}: re-analyse it.`,
        color: COLOURS.fail,
        bold: true,
      })),
    ],
    margin: [0, 0, 0, 8],
    unbreakable: true,
  };
}

// ---------------------------------------------------------------------------------------------------

function valueText(value: number | string | boolean | null, unit: string): string {
  if (value === null) return '—';
  // Tolerances, derating and drift are stored as fractions and read as percentages.
  if (typeof value === 'number' && unit === '%') return percent(value);
  if (typeof value === 'number') return quantity(value, unit);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return value;
}

const passWord = (pass: boolean | null) => (pass === null ? 'absent' : pass ? 'PASS' : 'FAIL');

export function changesSection(model: DossierPdfModel): Content[] {
  const diff = model.diff;
  const content: Content[] = [heading(diff ? `6  Changes since revision ${diff.against.number}` : '6  Changes since the previous revision')];
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
          { stack: [c.label, { text: c.path, font: MONO, fontSize: 6.5, color: COLOURS.muted }] },
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
  else {
    const unitOf = new Map(model.revision.results.checks.map((c) => [c.id, c.unit]));
    content.push(
      grid(
        ['Check', `Revision ${diff.against.number}`, `Revision ${model.revision.number}`],
        diff.checks.map((c): TableCell[] => {
          const unit = c.unit ?? unitOf.get(c.id) ?? '';
          return [
            c.label,
            { text: `${passWord(c.fromPass)}  ${quantity(c.from, unit)}`, color: c.fromPass === false ? COLOURS.fail : undefined },
            { text: `${passWord(c.toPass)}  ${quantity(c.to, unit)}`, color: c.toPass === false ? COLOURS.fail : undefined },
          ];
        }),
        ['*', 120, 120],
      ),
    );
  }
  content.push(subheading('Evidence'));
  if (!diff.evidenceAdded.length && !diff.evidenceRemoved.length) {
    content.push({ text: 'The same evidence files as before.', italics: true });
  }
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
      ...lines(diff.notesDiff.trimEnd(), (line) => ({
        font: MONO,
        fontSize: 7.5,
        color: line.startsWith('+') ? COLOURS.pass : line.startsWith('-') ? COLOURS.fail : line.startsWith('@@') ? COLOURS.muted : '#222222',
      })),
    );
  }
  return keepWithHeadings(content);
}

// ---------------------------------------------------------------------------------------------------

export function reviewsSection(model: DossierPdfModel): Content[] {
  const content: Content[] = [heading('7  Review history')];
  if (!model.reviews.length) {
    content.push({ text: 'No reviewer has decided on this dossier yet.', italics: true, margin: [0, 0, 0, 8] });
  }
  for (const r of model.reviews) {
    const word = DECISION_WORDS[r.decision];
    content.push({
      stack: [
        {
          text: [
            { text: word, bold: true, color: r.decision === 'approve' ? COLOURS.pass : COLOURS.fail },
            `   revision ${r.revisionNumber ?? model.revision.number}   ${timestamp(r.at)}   `,
            { text: r.reviewer.name, bold: true },
            ` <${r.reviewer.email}>`,
          ],
        },
        { text: [{ text: 'Content hash at decision  ', color: COLOURS.muted, fontSize: 7.5 }, { text: r.contentHash, font: MONO, fontSize: 7.5 }] },
        { text: r.comment || '(no comment)', margin: [12, 2, 0, 0], italics: !r.comment },
      ],
      margin: [0, 0, 0, 8],
      unbreakable: true,
    });
  }
  return keepWithHeadings(content);
}

export function auditSection(model: DossierPdfModel): Content[] {
  const { audit } = model;
  const broken = audit.firstBroken;
  return keepWithHeadings([
    heading('8  Audit chain'),
    audit.verified
      ? {
          text: [
            { text: 'VERIFIED  ', bold: true, color: COLOURS.pass },
            `${audit.events.toLocaleString('en-GB')} audit events checked; each links to the one before by its SHA-256, and no link is broken.`,
          ],
        }
      : {
          text: [
            { text: 'BROKEN  ', bold: true, color: COLOURS.fail },
            `${audit.events.toLocaleString('en-GB')} audit events checked; the chain does not verify`,
            broken ? ` from event ${broken.id}${broken.at ? ` (${timestamp(broken.at)})` : ''}${broken.reason ? `: ${broken.reason}` : ''}` : '',
            '. A record was changed or removed after it was written; treat this dossier with suspicion.',
          ],
        },
  ]);
}

/** "AB:CD:…" split after the sixteenth byte, so the 95 characters fit the column on two lines. */
function fingerprintLines(fingerprint: string): string {
  const bytes = fingerprint.split(':');
  return bytes.length > 16 ? `${bytes.slice(0, 16).join(':')}:\n${bytes.slice(16).join(':')}` : fingerprint;
}

export function signatureSection(model: DossierPdfModel, signingTime: Date): Content[] {
  const approval = approvalOf(model);
  if (!approval) throw new Error('An approved dossier needs the approving review decision.');
  const signer = model.signer;
  return keepWithHeadings([
    heading('Approval and digital signature', true),
    facts([
      ['Approved by', { text: approval.reviewer.name, bold: true }],
      ['E-mail', approval.reviewer.email],
      ['Approved at', timestamp(approval.at)],
      ['Revision', `Revision ${model.revision.number} of “${model.dossier.title}”`],
      ['Revision content hash (SHA-256)', mono(model.revision.contentHash, 7.5)],
      ['Content hash the reviewer approved', mono(approval.contentHash, 7.5)],
      ['Reviewer’s comment', approval.comment || '(no comment)'],
    ], 170),
    subheading('Digital signature'),
    facts([
      ['Signed at', timestamp(signingTime)],
      ['Signing certificate', signer.subject],
      ...(signer.fingerprintSha256 ? ([['Certificate SHA-256 fingerprint', mono(fingerprintLines(signer.fingerprintSha256), 7.5)]] as Array<[string, Content]>) : []),
      ['Certificate kind', signer.kind === 'development' ? { text: DEVELOPMENT_MARK, bold: true, color: COLOURS.neutral } : 'Organisation certificate'],
      ['Signature', 'CMS detached signature (PKCS #7), SHA-256, over the whole file except the signature itself'],
    ], 170),
    {
      text: 'Any change to this file after signing invalidates the signature. Check it in a PDF reader’s signature panel or with a command-line verifier, and compare the file’s SHA-256 with the copy the organisation holds.',
      margin: [0, 4, 0, 0],
    },
  ]);
}
