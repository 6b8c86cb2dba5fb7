// Fixed wording of the dossier. Kept apart from the layout so the words can be checked and reviewed alone.
import type { Check, DischargeResult } from '../../shared/schema/discharge';
import type { RevisionStatus } from './model';

/** docs/DOMAIN.md §6, printed in full in every dossier. */
export const CAUTIONS = [
  'Stored energy in DC-link capacitors can kill.',
  'Calculations here support, and never replace, measurement and the judgement of a qualified person.',
  'Verify absence of voltage with a rated meter before touching.',
  'Limits shown are the values the user entered; check them against the current edition of the applicable standard and local regulations, and defer to the certification body or licensed assessor.',
] as const;

/** The short form for the foot of every page after the cover. */
export const CAUTION_LINE = `${CAUTIONS[0]} Calculations support, never replace, measurement and a qualified person’s judgement; limits are the user’s entries — see the cautions on the cover.`;

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

export type CheckWord = 'PASS' | 'FAIL' | 'NOT MET' | 'FOR INFORMATION';

/**
 * The word printed beside a check. A check without a limit (stored energy when no energy limit is
 * set) decides nothing and is "for information", never PASS. An alternative criterion (energy,
 * charge) that is not met does not fail the dossier, because the time check already takes the
 * earliest criterion reached.
 */
export function checkVerdictWord(check: Pick<Check, 'pass' | 'alternative' | 'limit'>): CheckWord {
  if (check.limit === null) return 'FOR INFORMATION';
  if (check.pass) return 'PASS';
  return check.alternative ? 'NOT MET' : 'FAIL';
}

export const DECISION_WORDS = { approve: 'APPROVED', return: 'RETURNED' } as const;

/** The meaning of a decision as signed; records made before it was stored fall back to these. */
export const DECISION_MEANINGS = { approve: 'approved as reviewer', return: 'returned' } as const;

export const TRUSTED_TIME_WORDS = {
  with: 'The signature carries an RFC 3161 timestamp: the signing time is attested by the time-stamping authority, not by this server’s clock.',
  without: 'The signature carries no trusted timestamp (TSA_URL=none): its time is this server’s own claim.',
};
