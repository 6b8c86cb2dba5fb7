// Every query key in one place, so a mutation knows exactly what to invalidate.
import type { RingingInputRaw } from '../shared/schema/snubber';
import type { DischargeInput } from '../shared/schema/discharge';

export const keys = {
  me: ['me'] as const,
  users: ['users'] as const,
  outbox: ['outbox'] as const,
  overview: ['overview'] as const,
  products: ['products'] as const,
  dossiers: ['dossiers'] as const,
  dossier: (id: number) => ['dossiers', id] as const,
  revision: (id: number) => ['revisions', id] as const,
  diff: (id: number, against?: number) => ['revisions', id, 'diff', against ?? 'previous'] as const,
  /** Every comparison of revision `id` with another. */
  diffs: (id: number) => ['revisions', id, 'diff'] as const,
  reviews: ['reviews'] as const,
  audit: (dossierId: number) => ['audit', dossierId] as const,
  invite: (token: string) => ['invite', token] as const,
  snubberSizing: (input: RingingInputRaw | null) => ['calc', 'snubber', input] as const,
  /** One stateless discharge check per input; the input itself is the key. */
  calcDischarge: (input: DischargeInput | null) => ['calc', 'discharge', input] as const,
};
