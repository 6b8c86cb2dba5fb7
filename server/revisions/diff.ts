import { createTwoFilesPatch, diffLines } from 'diff';
import { diffDesignInputs, type InputChange } from '../../shared/design-diff';
import type { Revision } from './store';

export interface CheckChange {
  id: string;
  label: string;
  from: { value: number | null; pass: boolean; unit: string } | null;
  to: { value: number | null; pass: boolean; unit: string } | null;
  /** "now-fails" stands out: a check that passed and no longer does. */
  kind: 'now-fails' | 'now-passes' | 'value-changed' | 'added' | 'removed';
}

export interface RevisionDiff {
  revision: { id: number; number: number };
  against: { id: number; number: number };
  inputs: InputChange[];
  verdict: { from: string; to: string } | null;
  checks: CheckChange[];
  notes: { changed: boolean; parts: Array<{ added: boolean; removed: boolean; value: string }>; patch: string };
  evidence: { added: Array<{ name: string; sha256: string; kind: string }>; removed: Array<{ name: string; sha256: string; kind: string }> };
}

/** diffRevisions: inputs in engineering units with % change, checks and verdict, notes line by line, evidence by hash. */
export function diffRevisions(current: Revision, previous: Revision): RevisionDiff {
  const oldChecks = new Map((previous.results.checks ?? []).map((c) => [c.id, c]));
  const newChecks = new Map((current.results.checks ?? []).map((c) => [c.id, c]));
  const checks: CheckChange[] = [];
  for (const id of new Set([...oldChecks.keys(), ...newChecks.keys()])) {
    const a = oldChecks.get(id);
    const b = newChecks.get(id);
    const side = (c: typeof a) => (c ? { value: c.value, pass: c.pass, unit: c.unit } : null);
    let kind: CheckChange['kind'] | null = null;
    if (a && !b) kind = 'removed';
    else if (!a && b) kind = 'added';
    else if (a && b && a.pass && !b.pass) kind = 'now-fails';
    else if (a && b && !a.pass && b.pass) kind = 'now-passes';
    else if (a && b && a.value !== b.value) kind = 'value-changed';
    if (kind) checks.push({ id, label: (b ?? a)!.label, from: side(a), to: side(b), kind });
  }
  const rank: Record<CheckChange['kind'], number> = { 'now-fails': 0, 'now-passes': 1, 'value-changed': 2, added: 3, removed: 4 };
  checks.sort((x, y) => rank[x.kind] - rank[y.kind]);

  const oldEvidence = new Map(previous.evidence.map((e) => [e.sha256, e]));
  const newEvidence = new Map(current.evidence.map((e) => [e.sha256, e]));
  const brief = (e: Revision['evidence'][number]) => ({ name: e.originalName, sha256: e.sha256, kind: e.kind });

  return {
    revision: { id: current.id, number: current.number },
    against: { id: previous.id, number: previous.number },
    inputs: diffDesignInputs(previous.design, current.design),
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
