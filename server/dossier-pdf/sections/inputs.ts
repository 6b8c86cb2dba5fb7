// Section 1: the requirement in the user's words and the design inputs, labelled and formatted from
// the shared field descriptors (the same ones the form and the diff use).
import type { Content, TableCell } from 'pdfmake/interfaces';
import { formatField, getPath } from '../../../shared/design-fields';
import {
  ACTIVE_FIELDS,
  ACTIVE_MODE_WORDS,
  DESIGN_GROUPS,
  REQUIREMENT_FIELDS,
  SNUBBER_KIND_WORDS,
  SNUBBER_OTHER_FIELDS,
  snubberFieldsOf,
  snubberValue,
  type FieldSpec,
  type SnubberFieldSpec,
} from '../../../shared/schema/fields';
import type { DesignDraft } from '../../../shared/schema/discharge';
import type { SnubberDraft } from '../../../shared/schema/snubber';
import { COLOURS, facts, heading, HEADED, keepWithHeadings, subheading } from '../layout';
import { markdownContent } from '../markdown';
import type { DossierPdfModel } from '../model';

/** Engineering units with four significant digits: an assessor may recompute from the printed inputs. */
const DIGITS = 4;

type Row = [string, string];

const valueOf = (spec: Pick<FieldSpec, 'kind' | 'optional'>, value: unknown): string => {
  // Typographic minus, as in the rest of the dossier (−25 °C).
  if (typeof value === 'number') return formatField(spec.kind, value, DIGITS).replace(/^-/, '−');
  return spec.optional ? '— (none entered)' : '— (not entered)';
};

const rowsOf = (fields: readonly FieldSpec[], root: unknown): Row[] => fields.map((f) => [f.label, valueOf(f, getPath(root, f.path))]);

function designGroups(design: DesignDraft): Array<{ title: string; rows: Row[] }> {
  const groups = DESIGN_GROUPS.filter((g) => !g.optional || getPath(design, g.key) != null).map((g) => ({
    title: g.title,
    rows: rowsOf(g.fields, design),
  }));
  const active = design.active;
  groups.push({
    title: 'Active discharge',
    rows: active
      ? [['Circuit', ACTIVE_MODE_WORDS[active.mode]], ...rowsOf(ACTIVE_FIELDS[active.mode], design)]
      : [['Circuit', 'None declared (passive bleeders only)']],
  });
  for (const [i, s] of (design.snubbers ?? []).entries()) groups.push({ title: `Snubber: ${s.name || `#${i + 1} (unnamed)`}`, rows: snubberRows(s) });
  return groups;
}

function snubberRows(s: SnubberDraft): Row[] {
  const field = (f: SnubberFieldSpec): Row => [f.label, valueOf({ kind: f.kind }, snubberValue(s, f.key))];
  return [
    [SNUBBER_OTHER_FIELDS.kind.label, SNUBBER_KIND_WORDS[s.kind]],
    [SNUBBER_OTHER_FIELDS.location.label, s.location || '—'],
    ...snubberFieldsOf(s.kind, 'parts').map(field),
    ...snubberFieldsOf(s.kind, 'operating').map(field),
    [SNUBBER_OTHER_FIELDS.accessible.label, s.accessible ? 'Yes' : 'No'],
    ...snubberFieldsOf(s.kind, 'kind')
      .filter((f) => snubberValue(s, f.key) != null)
      .map(field),
  ];
}

/** Whether the requirement asks for the single-fault condition, where the stored requirement says either way. */
function singleFaultRow(req: object): Row[] {
  const asked = (req as { singleFault?: boolean | null }).singleFault;
  if (asked === undefined || asked === null) return [];
  return [['Single-fault condition', asked ? 'Assessed: one fault at a time in the discharge network' : 'Not asked by the requirement']];
}

export function inputsSection(model: DossierPdfModel): Content[] {
  const req = model.dossier.requirement;
  const content: Content[] = [
    heading('1  Requirement and design inputs', true),
    subheading('Requirement, as entered by the user', true),
    facts(
      [
        ['Standard and clause', { text: req.reference || '— (not entered)', bold: true }],
        ['Condition', req.condition || '— (not entered)'],
        ...rowsOf(REQUIREMENT_FIELDS, req),
        ...singleFaultRow(req),
      ],
      190,
    ),
    subheading('Design inputs', true),
  ];
  for (const group of designGroups(model.revision.design)) {
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
  const notes = model.revision.notes.trim();
  if (notes) content.push(subheading('Engineer’s notes', true), ...markdownContent(notes));
  return keepWithHeadings(content);
}
