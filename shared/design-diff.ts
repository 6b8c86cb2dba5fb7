// What changed between two design drafts, input by input, in the engineer's units: used by the
// revision diff (server) and by the app when a draft was saved elsewhere meanwhile.
import { fieldUnitLabel, formatField } from './design-fields';
import type { InputChange } from './schema/api';
import type { DesignDraft } from './schema/discharge';
import { ALL_DESIGN_FIELDS, nounOf, snubberFieldWords, type FieldKind } from './schema/fields';

function flatten(obj: unknown, prefix = ''): Map<string, unknown> {
  const out = new Map<string, unknown>();
  if (obj && typeof obj === 'object' && !Array.isArray(obj)) {
    for (const [k, v] of Object.entries(obj)) {
      for (const [p, leaf] of flatten(v, prefix ? `${prefix}.${k}` : k)) out.set(p, leaf);
    }
  } else if (Array.isArray(obj)) {
    obj.forEach((v, i) => {
      for (const [p, leaf] of flatten(v, `${prefix}[${i}]`)) out.set(p, leaf);
    });
  } else if (prefix) {
    out.set(prefix, obj);
  }
  return out;
}

const KNOWN = new Map(ALL_DESIGN_FIELDS.map((f) => [f.path, f]));

function show(kind: FieldKind | undefined, value: unknown): string {
  if (value === undefined || value === null) return '—';
  if (kind && typeof value === 'number') return formatField(kind, value);
  return String(value);
}

function describePath(path: string, design: DesignDraft): { label: string; kind?: FieldKind } {
  const known = KNOWN.get(path);
  if (known) return { label: known.label, kind: known.kind };
  const snub = /^snubbers\[(\d+)]\.(\w+)$/.exec(path);
  if (snub) {
    const name = design.snubbers?.[Number(snub[1])]?.name || `#${Number(snub[1]) + 1}`;
    const spec = snubberFieldWords(snub[2]);
    const words = spec ? nounOf(spec).replace(/^./, (c) => c.toLowerCase()) : snub[2];
    return { label: `Snubber ${name}: ${words}`, kind: spec?.kind };
  }
  return { label: path };
}

/** Every input that differs, in the order of the design form, labelled and formatted with its unit. */
export function diffDesignInputs(previous: DesignDraft, current: DesignDraft): InputChange[] {
  const before = flatten(previous);
  const after = flatten(current);
  const paths = [...new Set([...before.keys(), ...after.keys()])];
  const order = (p: string) => {
    const i = ALL_DESIGN_FIELDS.findIndex((f) => f.path === p);
    return i === -1 ? 1000 : i;
  };
  return paths
    .filter((p) => JSON.stringify(before.get(p) ?? null) !== JSON.stringify(after.get(p) ?? null))
    .sort((a, b) => order(a) - order(b) || a.localeCompare(b))
    .map((path) => {
      const { label, kind } = describePath(path, current.snubbers ? current : previous);
      const a = before.get(path);
      const b = after.get(path);
      const changePct = typeof a === 'number' && typeof b === 'number' && a !== 0 ? ((b - a) / Math.abs(a)) * 100 : null;
      return {
        path,
        label,
        unit: kind ? fieldUnitLabel(kind) : '',
        from: show(kind, a),
        to: show(kind, b),
        fromValue: (a ?? null) as number | string | null,
        toValue: (b ?? null) as number | string | null,
        changePct,
      };
    });
}

/** The inverse of `flatten`: "a.b[0].c" paths back into objects and (gap-free) arrays. */
function unflatten(leaves: Map<string, unknown>): Record<string, unknown> {
  const root: Record<string, unknown> = {};
  for (const [path, value] of leaves) {
    const keys = [...path.matchAll(/([^.[\]]+)|\[(\d+)]/g)].map((m) => (m[2] === undefined ? m[1] : Number(m[2])));
    let at: Record<string | number, unknown> = root;
    keys.forEach((key, i) => {
      if (i === keys.length - 1) at[key] = value;
      else at = (at[key] ??= typeof keys[i + 1] === 'number' ? [] : {}) as Record<string | number, unknown>;
    });
  }
  const compact = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.filter((x) => x !== undefined).map(compact)
      : v && typeof v === 'object'
        ? Object.fromEntries(Object.entries(v).map(([k, x]) => [k, compact(x)]))
        : v;
  return compact(root) as Record<string, unknown>;
}

/**
 * Three-way merge of a draft saved elsewhere: the stored design with the inputs this user changed
 * (relative to the version they started from) applied on top. Where both changed an input, this
 * user's value wins — it is what they chose to keep; inputs only changed elsewhere stay as stored.
 */
export function mergeDesigns(base: DesignDraft, mine: DesignDraft, stored: DesignDraft): DesignDraft {
  const before = flatten(base);
  const ours = flatten(mine);
  const merged = flatten(stored);
  for (const path of new Set([...before.keys(), ...ours.keys()])) {
    if (JSON.stringify(before.get(path) ?? null) === JSON.stringify(ours.get(path) ?? null)) continue;
    if (ours.has(path)) merged.set(path, ours.get(path));
    else merged.delete(path);
  }
  // The tree has the draft's own shape: only leaves of the three drafts were moved.
  return unflatten(merged) as DesignDraft;
}
