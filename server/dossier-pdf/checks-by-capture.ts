// Which checks come from which capture. Evidence-derived checks carry `evidenceSha256` (and ids
// "measured-discharge:<first 12 hex of the sha256>"); the kind of any check is its id before ":".
import type { Check } from '../../shared/schema/discharge';

export type CheckWithEvidence = Check & { evidenceId?: string | number; evidenceSha256?: string };

export const checkKind = (id: string) => id.split(':')[0];

const isSingleFault = (check: Pick<Check, 'id'>) => checkKind(check.id).startsWith('single-fault');

interface KnownFile {
  sha256: string;
  /** The file name; checks that name no hash are matched by it in their label. */
  name?: string;
  originalName?: string;
}

/**
 * The capture's sha256 a check belongs to: its own field, else the hex after ":" in its id, else
 * (checks stored before ids named the capture) the file name in its label.
 */
export function captureOf(check: { id: string; evidenceSha256?: string; label?: string }, known: readonly KnownFile[]): string | null {
  if (check.evidenceSha256) return check.evidenceSha256;
  const suffix = check.id.split(':')[1];
  if (suffix && /^[0-9a-f]{6,64}$/.test(suffix)) return known.find((e) => e.sha256.startsWith(suffix))?.sha256 ?? null;
  const label = check.label;
  if (!label || !checkKind(check.id).startsWith('measured-')) return null;
  return (
    known.find((e) => {
      const name = e.name ?? e.originalName;
      return !!name && label.includes(`(${name})`);
    })?.sha256 ?? null
  );
}

export const isEvidenceCheck = (check: CheckWithEvidence) => !!check.evidenceSha256 || checkKind(check.id).startsWith('measured-');

interface CheckGroups<T> {
  calculated: T[];
  singleFault: T[];
  /** By capture sha256 in first-seen order; null gathers evidence checks whose capture is unknown. */
  byCapture: Array<{ sha256: string | null; checks: T[] }>;
}

export function groupChecks<T extends { id: string; evidenceSha256?: string; label?: string }>(
  checks: readonly T[],
  known: readonly KnownFile[],
  evidence: (c: T) => boolean,
): CheckGroups<T> {
  const groups: CheckGroups<T> = { calculated: [], singleFault: [], byCapture: [] };
  for (const check of checks) {
    if (evidence(check)) {
      const sha256 = captureOf(check, known);
      let group = groups.byCapture.find((g) => g.sha256 === sha256);
      if (!group) groups.byCapture.push((group = { sha256, checks: [] }));
      group.checks.push(check);
    } else if (isSingleFault(check)) groups.singleFault.push(check);
    else groups.calculated.push(check);
  }
  return groups;
}
