// The dossier's page-layout toolkit: fonts, colours, headings that never sit alone at a page foot,
// tables that split cleanly, and fact lists. Every function builds fresh objects: pdfmake writes
// layout state into the definition it is given, so nothing here may be shared between two documents.
import type { Content, TableCell } from 'pdfmake/interfaces';

export const FONT = 'DejaVuSans';
export const MONO = 'DejaVuSansMono';
/** Printable width of an A4 page with the dossier's 40 pt side margins. */
export const CONTENT_WIDTH = 595.28 - 80;

export const COLOURS = {
  pass: '#1b5e20',
  fail: '#b71c1c',
  neutral: '#7a5a00',
  info: '#37474f',
  muted: '#5f6368',
  rule: '#c8c8c8',
  band: '#f3f4f6',
  nominal: '#1f4e9c',
  worst: '#c62828',
  /** One per capture, in upload order; far from the calculated curves' blue and red. */
  traces: ['#7b1fa2', '#00838f', '#e65100', '#558b2f', '#6d4c41', '#ad1457'],
};

export const traceColour = (index: number) => COLOURS.traces[index % COLOURS.traces.length];

export const mono = (text: string, fontSize = 8): Content => ({ text, font: MONO, fontSize });

// Headings and the captions under them are "leads": keepWithHeadings glues them to the block they
// introduce, so none is left at the foot of a page. Doing it in the definition keeps pdfmake to one
// layout pass; its pageBreakBefore hook relayouts the whole document for every heading it moves.
const LEADS = new WeakSet<object>();
type Block = Exclude<Content, string | number | Content[]>;
export function lead(item: Block): Block {
  LEADS.add(item);
  return item;
}

/** Leads that start a new page; the break goes on the glued block, since a break inside it is ignored. */
const NEW_PAGE = new WeakSet<object>();

/** A numbered section heading; it is listed in the table of contents. */
export function heading(text: string, newPage = false): Content {
  const node = lead({ text, style: 'h1', tocItem: true, tocMargin: [0, 3, 0, 0] } as Block);
  if (newPage) NEW_PAGE.add(node);
  return node;
}

/** A sub-heading, listed indented in the table of contents when `listed`. */
export const subheading = (text: string, listed = false): Content =>
  lead({
    text,
    style: 'h2',
    ...(listed ? { tocItem: true, tocStyle: { fontSize: 8.5, color: COLOURS.muted }, tocMargin: [14, 1, 0, 0] } : {}),
  } as Block);

export const caption = (text: string): Content => lead({ text, color: COLOURS.muted, fontSize: 8, margin: [0, 0, 0, 4] });

interface TableNode {
  table: { body: unknown[] };
}

/** Hairlines between rows only: the table reads as a list of facts, not as a grid. */
const RULED = {
  hLineWidth: (i: number, node: TableNode) => (i === 0 || i === node.table.body.length ? 0 : 0.5),
  vLineWidth: () => 0,
  hLineColor: () => COLOURS.rule,
  paddingLeft: (i: number) => (i === 0 ? 0 : 6),
  paddingRight: () => 4,
  paddingTop: () => 2.5,
  paddingBottom: () => 2.5,
};

/** As RULED, with a darker rule under the header row. */
export const HEADED = {
  ...RULED,
  hLineWidth: (i: number, node: TableNode) => (i === 0 || i === node.table.body.length ? 0 : i === 1 ? 0.8 : 0.5),
  hLineColor: (i: number) => (i === 1 ? '#888888' : COLOURS.rule),
  paddingLeft: () => 4,
};

/** The rest of a split table: its top rule continues the part above; no header row. */
const CONTINUED = {
  ...HEADED,
  hLineWidth: (i: number, node: TableNode) => (i === node.table.body.length ? 0 : 0.5),
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

export function splittable(spec: TableSpec): Content {
  const node = tablePart(spec, 0, spec.rows.length);
  TABLES.set(node as object, spec);
  return node;
}

/** Glues every run of leads to the block after it; a long table gives only its first rows to the glue. */
export function keepWithHeadings(items: readonly Content[]): Content[] {
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
      out.push({ stack: [...leads, tablePart(spec, 0, LEAD_ROWS)], unbreakable: true, ...pageBreak }, tablePart(spec, LEAD_ROWS, spec.rows.length));
    } else {
      out.push({ stack: [...leads, item], unbreakable: true, ...pageBreak });
    }
    leads = [];
  }
  if (leads.length) out.push({ stack: leads });
  return out;
}

/** Two-column label/value table with light rules. */
export function facts(rows: Array<[string, Content]>, labelWidth = 150): Content {
  return {
    table: {
      widths: [labelWidth, '*'],
      dontBreakRows: true,
      body: rows.map(([label, value]): TableCell[] => [{ text: label, color: COLOURS.muted }, value as TableCell]),
    },
    layout: RULED,
    margin: [0, 2, 0, 8],
  };
}

export const headerRow = (titles: string[]): TableCell[] => titles.map((h): TableCell => ({ text: h, bold: true, fillColor: COLOURS.band }));

export function grid(header: string[], rows: TableCell[][], widths: Array<number | string>): Content {
  return splittable({ header: headerRow(header), rows, widths });
}

/** A full-width tinted box (cover banners, the caution line). */
export function band(content: Content, fill: string, colour: string, margin: [number, number, number, number] = [0, 0, 0, 4]): Content {
  return {
    table: { widths: ['*'], body: [[{ stack: [content], fillColor: fill, color: colour, margin: [6, 4, 6, 4] }]] },
    layout: 'noBorders',
    margin,
    unbreakable: true,
  };
}

/** A small filled square in a capture's colour, so its table, notes and chart line can be matched. */
export function swatch(colour: string): Content {
  return { stack: [{ canvas: [{ type: 'rect', x: 0, y: 1.5, w: 7, h: 7, color: colour }] }], width: 10 } as Content;
}
