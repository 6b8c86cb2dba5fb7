import { ZxcvbnFactory, type MatchExtended } from '@zxcvbn-ts/core';
import * as common from '@zxcvbn-ts/language-common';
import { MIN_PASSWORD_LENGTH, passwordLength } from '../../shared/schema/auth';

/** zxcvbn's score runs 0–4; 3 means about 10^8 guesses or more, out of reach of a throttled online attack. */
const MIN_SCORE = 3;

let estimator: ZxcvbnFactory | null = null;
// Built on first use: loading the common-password dictionary takes tens of milliseconds.
const zxcvbn = () => (estimator ??= new ZxcvbnFactory({ dictionary: { ...common.dictionary }, graphs: common.adjacencyGraphs }));

interface PasswordOwner {
  name: string;
  email: string;
  organisation: string;
}

/** What an attacker tries first for this account: the person's names, the e-mail's parts, the product and the organisation. */
function userInputs(owner: PasswordOwner): string[] {
  const [local, domain = ''] = owner.email.toLowerCase().split('@');
  const words = (s: string) =>
    s
      .toLowerCase()
      .split(/[^\p{L}\p{N}]+/u)
      .filter((w) => w.length >= 3);
  return [
    ...new Set([
      owner.name,
      ...words(owner.name),
      owner.email,
      local,
      ...words(local),
      ...words(domain.replace(/\.[^.]+$/, '')),
      'voltfall',
      owner.organisation,
      ...words(owner.organisation),
    ]),
  ];
}

// Why a guessable password is guessable, in the order a reader should hear it.
const REASONS: Array<[test: (m: MatchExtended) => boolean, reason: string]> = [
  [
    (m) => m.pattern === 'dictionary' && String(m.dictionaryName).startsWith('passwords'),
    'it is, or is close to, a password on lists of common passwords',
  ],
  [(m) => m.pattern === 'repeat', 'it repeats characters or a short pattern'],
  [(m) => m.pattern === 'sequence', 'it contains a run such as abcd or 1234'],
  [(m) => m.pattern === 'spatial', 'it follows a keyboard pattern'],
  [(m) => m.pattern === 'date' || (m.pattern === 'regex' && m.regexName === 'recentYear'), 'it leans on a date or a year'],
  [(m) => m.pattern === 'dictionary', 'it is made of common words or names'],
];

const ADVICE = 'Try four or more unrelated words, or a longer phrase of your own.';

/**
 * Why this password would be refused (ASVS 2.1), or null when it is strong enough: at least 12
 * characters once repeated spaces are merged and the ends trimmed, not built mostly from the account's
 * own name, e-mail or the product's name, and a zxcvbn score of at least 3 against its common-password
 * dictionary with those words added.
 */
export function passwordProblem(password: string, owner: PasswordOwner): string | null {
  if (passwordLength(password) < MIN_PASSWORD_LENGTH) {
    return `Use at least ${MIN_PASSWORD_LENGTH} characters; spaces at the ends and repeated spaces do not count.`;
  }
  const result = zxcvbn().check(password, userInputs(owner));
  const own = result.sequence.filter((m) => m.pattern === 'dictionary' && m.dictionaryName === 'userInputs').reduce((n, m) => n + m.token.length, 0);
  if (own * 2 >= password.length) {
    return `Too easy to guess: it is built from your name, your e-mail address or the product's name. ${ADVICE}`;
  }
  if (result.score >= MIN_SCORE) return null;
  const reason = REASONS.find(([test]) => result.sequence.some(test))?.[1] ?? 'it is short for the kinds of characters it uses';
  return `Too easy to guess: ${reason}. ${ADVICE}`;
}
