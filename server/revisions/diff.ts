import { createTwoFilesPatch, diffLines } from 'diff';
import { ALL_DESIGN_FIELDS, fieldUnitLabel, formatField, type FieldKind } from '../../shared/design-fields';
import type { CheckChange, CheckSide, InputChange, RevisionDiff } from '../../shared/schema/api';
import { isInformational, type Check } from '../../shared/schema/discharge';
import type { QuantityUnit } from '../../shared/units';
import type { Revision } from './store';


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

// Snubber fields in plain words (the rest of the design is described in shared/design-fields.ts).
const SNUBBER_WORDS: Record<string, string> = {
  name: 'name', location: 'location', kind: 'kind', resistance: 'resistance', capacitance: 'capacitance',
  capacitanceTolerance: 'capacitance tolerance', powerRating: 'resistor power rating', derating: 'derating',
  capacitorVoltageRating: 'capacitor voltage rating', switchingVoltage: 'switching voltage', overshoot: 'overshoot',
  switchingFrequency: 'switching frequency', accessible: 'accessible after switch-off', parasiticInductance: 'loop inductance',
  parasiticCapacitance: 'node capacitance', switchedCurrent: 'switched current', fallTime: 'current fall time',
  minOnTime: 'minimum on-time', leakageInductance: 'leakage inductance', peakCurrent: 'peak current',
  clampVoltage: 'clamp voltage', reflectedVoltage: 'reflected voltage',
};
const SNUBBER_UNITS: Record<string, QuantityUnit> = {
  resistance: 'Ω', capacitance: 'F', powerRating: 'W', capacitorVoltageRating: 'V', switchingVoltage: 'V', switchingFrequency: 'Hz',
  parasiticInductance: 'H', parasiticCapacitance: 'F', switchedCurrent: 'A', fallTime: 's', minOnTime: 's', leakageInductance: 'H',
  peakCurrent: 'A', clampVoltage: 'V', reflectedVoltage: 'V',
};

function describePath(path: string, design: Revision['design']): { label: string; kind?: FieldKind } {
  const known = KNOWN.get(path);
  if (known) return { label: known.label, kind: known.kind };
  const snub = /^snubbers\[(\d+)]\.(\w+)$/.exec(path);
  if (snub) {
    const name = design.snubbers?.[Number(snub[1])]?.name || `#${Number(snub[1]) + 1}`;
    const unit = SNUBBER_UNITS[snub[2]];
    const kind: FieldKind | undefined = unit ? { type: 'quantity', unit } : ['capacitanceTolerance', 'derating', 'overshoot'].includes(snub[2]) ? { type: 'percent' } : undefined;
    return { label: `Snubber ${name}: ${SNUBBER_WORDS[snub[2]] ?? snub[2]}`, kind };
  }
  return { label: path };
}

/** The file a measured check comes from, by its evidence id in that revision (or, failing that, its hash). */
function evidenceOf(check: Check, rev: Revision): CheckChange['evidence'] {
  if (!check.evidenceSha256) return null;
  const row = rev.evidence.find((e) => e.id === check.evidenceId) ?? rev.evidence.find((e) => e.sha256 === check.evidenceSha256);
  return { name: row?.originalName ?? check.evidenceSha256.slice(0, 12), sha256: check.evidenceSha256 };
}

const side = (c: Check | undefined): CheckSide | null => (c ? { value: c.value, pass: c.pass, unit: c.unit, informational: isInformational(c) } : null);

/**
 * Checks paired by id. A capture's checks carry its file's hash in their id, so a file carried into
 * the next revision pairs with itself, and a replaced file's checks are removed and the new file's
 * added, never compared with each other.
 */
function diffChecks(previous: Revision, current: Revision): CheckChange[] {
  const oldChecks = new Map((previous.results.checks ?? []).map((c) => [c.id, c]));
  const newChecks = new Map((current.results.checks ?? []).map((c) => [c.id, c]));
  const checks: CheckChange[] = [];
  for (const id of new Set([...oldChecks.keys(), ...newChecks.keys()])) {
    const a = oldChecks.get(id);
    const b = newChecks.get(id);
    let kind: CheckChange['kind'] | null = null;
    if (a && !b) kind = 'removed';
    else if (!a && b) kind = 'added';
    else if (a && b && a.pass && !b.pass) kind = 'now-fails';
    else if (a && b && !a.pass && b.pass) kind = 'now-passes';
    else if (a && b && a.value !== b.value) kind = 'value-changed';
    if (kind) checks.push({ id, label: (b ?? a)!.label, from: side(a), to: side(b), kind, evidence: b ? evidenceOf(b, current) : evidenceOf(a!, previous) });
  }
  const rank: Record<CheckChange['kind'], number> = { 'now-fails': 0, 'now-passes': 1, 'value-changed': 2, added: 3, removed: 4 };
  return checks.sort((x, y) => rank[x.kind] - rank[y.kind]);
}

/** diffRevisions: inputs in engineering units with % change, checks and verdict, notes line by line, evidence by hash. */
export function diffRevisions(current: Revision, previous: Revision): RevisionDiff {
  const before = flatten(previous.design);
  const after = flatten(current.design);
  const paths = [...new Set([...before.keys(), ...after.keys()])];
  const order = (p: string) => {
    const i = ALL_DESIGN_FIELDS.findIndex((f) => f.path === p);
    return i === -1 ? 1000 : i;
  };
  const inputs: InputChange[] = paths
    .filter((p) => JSON.stringify(before.get(p) ?? null) !== JSON.stringify(after.get(p) ?? null))
    .sort((a, b) => order(a) - order(b) || a.localeCompare(b))
    .map((path) => {
      const { label, kind } = describePath(path, current.design.snubbers ? current.design : previous.design);
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

  const checks = diffChecks(previous, current);
  const oldEvidence = new Map(previous.evidence.map((e) => [e.sha256, e]));
  const newEvidence = new Map(current.evidence.map((e) => [e.sha256, e]));
  const brief = (e: Revision['evidence'][number]) => ({ name: e.originalName, sha256: e.sha256, kind: e.kind });

  return {
    revision: { id: current.id, number: current.number },
    against: { id: previous.id, number: previous.number },
    inputs,
    verdict: previous.results.verdict !== current.results.verdict ? { from: previous.results.verdict, to: current.results.verdict } : null,
    checks,
    notes: {
      changed: previous.notes !== current.notes,
      parts: diffLines(previous.notes, current.notes).map((p) => ({ added: Boolean(p.added), removed: Boolean(p.removed), value: p.value })),
      patch: createTwoFilesPatch(`revision ${previous.number}`, `revision ${current.number}`, previous.notes, current.notes),
    },
    evidence: {
      added: current.evidence.filter((e) => !oldEvidence.has(e.sha256)).map(brief),
      removed: previous.evidence.filter((e) => !newEvidence.has(e.sha256)).map(brief),
    },
  };
}
