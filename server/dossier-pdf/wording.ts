// Fixed wording of the dossier. Kept apart from the layout so the words can be checked and reviewed alone.
import type { Check, DischargeResult } from '../../shared/schema/discharge';
import type { RevisionStatus } from './model';

/** DESIGN.md §7, printed in full in every dossier. */
export const CAUTIONS = [
  'Stored energy in DC-link capacitors can kill.',
  'Calculations here support, and never replace, measurement and the judgement of a qualified person.',
  'Verify absence of voltage with a rated meter before touching.',
  'Limits shown are the values the user entered; check them against the current edition of the applicable standard and local regulations, and defer to the certification body or licensed assessor.',
] as const;

export const NOT_APPROVED_MARK = 'NOT APPROVED — not for certification';
export const DEVELOPMENT_MARK = 'Development certificate — not for certification';

export const STATUS_WORDS: Record<RevisionStatus, string> = {
  draft: 'Draft — not yet submitted for review',
  in_review: 'In review — awaiting a reviewer’s decision',
  approved: 'Approved',
  returned: 'Returned to the author for changes',
};

/** For the running header, where space is short. */
export const STATUS_SHORT: Record<RevisionStatus, string> = {
  draft: 'Draft',
  in_review: 'In review',
  approved: 'Approved',
  returned: 'Returned',
};

export const VERDICT_WORDS: Record<DischargeResult['verdict'], string> = {
  meets: 'Meets the entered requirement: every deciding check passes',
  fails: 'Fails: at least one deciding check does not pass',
  incomplete: 'Incomplete: inputs are missing, so no verdict is possible',
};

/**
 * The word printed beside a check. An alternative criterion (energy, charge) that is not met does not
 * fail the dossier, because the time check already takes the earliest criterion reached.
 */
export function checkVerdictWord(check: Pick<Check, 'pass' | 'alternative'>): 'PASS' | 'FAIL' | 'NOT MET' {
  if (check.pass) return 'PASS';
  return check.alternative ? 'NOT MET' : 'FAIL';
}

export const DECISION_WORDS = { approve: 'APPROVED', return: 'RETURNED' } as const;
