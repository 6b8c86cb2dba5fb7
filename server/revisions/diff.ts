import { createTwoFilesPatch, diffLines } from 'diff';
import { diffDesignInputs } from '../../shared/design-diff';
import type { CheckChange, CheckSide, RevisionDiff } from '../../shared/schema/api';
import { isInformational, type Check } from '../../shared/schema/discharge';
import type { Revision } from './store';

/** The file a measured check comes from, by its evidence id in that revision (or, failing that, its hash). */
function evidenceOf(check: Check, rev: Revision): CheckChange['evidence'] {
  if (!check.evidenceSha256) return null;
  const row = rev.evidence.find((e) => e.id === check.evidenceId) ?? rev.evidence.find((e) => e.sha256 === check.evidenceSha256);
  return { name: row?.originalName ?? check.evidenceSha256.slice(0, 12), sha256: check.evidenceSha256 };
}

const side = (c: Check | undefined): CheckSide | null =>
  c ? { value: c.value, pass: c.pass, unit: c.unit, informational: isInformational(c) } : null;

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
    if (kind)
      checks.push({ id, label: (b ?? a)!.label, from: side(a), to: side(b), kind, evidence: b ? evidenceOf(b, current) : evidenceOf(a!, previous) });
  }
  const rank: Record<CheckChange['kind'], number> = { 'now-fails': 0, 'now-passes': 1, 'value-changed': 2, added: 3, removed: 4 };
  return checks.sort((x, y) => rank[x.kind] - rank[y.kind]);
}

/** diffRevisions: inputs in engineering units with % change, checks and verdict, notes line by line, evidence by hash. */
export function diffRevisions(current: Revision, previous: Revision): RevisionDiff {
  const checks = diffChecks(previous, current);

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
