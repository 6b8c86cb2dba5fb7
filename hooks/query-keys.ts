// Every query key in one place, so a mutation knows exactly what to invalidate.
import type { RingingInputRaw } from '../shared/schema/snubber';
import type { OverviewList } from '../shared/schema/api';
import type { DischargeInput } from '../shared/schema/discharge';
import type { DossierListFilter } from '../shared/schema/lists';

export const keys = {
  me: ['me'] as const,
  users: ['users'] as const,
  outbox: ['outbox'] as const,
  overview: ['overview'] as const,
  products: ['products'] as const,
  dossiers: ['dossiers'] as const,
  /** One paged dossier list per filter; all of them sit under `dossiers`, so invalidating that refreshes each. */
  dossierList: (filter: DossierListFilter) => ['dossiers', 'list', filter] as const,
  dossier: (id: number) => ['dossiers', id] as const,
  revision: (id: number) => ['revisions', id] as const,
  diff: (id: number, against?: number) => ['revisions', id, 'diff', against ?? 'previous'] as const,
  /** Every comparison of revision `id` with another. */
  diffs: (id: number) => ['revisions', id, 'diff'] as const,
  reviews: ['reviews'] as const,
  overviewList: (list: OverviewList) => ['overview', list] as const,
  audit: (dossierId: number) => ['audit', dossierId] as const,
  invite: (token: string) => ['invite', token] as const,
  snubberSizing: (input: RingingInputRaw | null) => ['calc', 'snubber', input] as const,
  /** One stateless discharge check per input; the input itself is the key. */
  calcDischarge: (input: DischargeInput | null) => ['calc', 'discharge', input] as const,
};
