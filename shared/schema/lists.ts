// Paged lists: the query every list route takes and the page it answers (docs/ARCHITECTURE.md §6.1).
import { z } from 'zod';
import { revisionStatuses } from './workflow';

export const PAGE_DEFAULT = 50;
export const PAGE_MAX = 200;

/** One page of a list, newest (or, for the review queue, oldest) first; `nextCursor` is null on the last page. */
export interface Page<T> {
  items: T[];
  nextCursor: string | null;
  total: number;
}

const whole = (what: string) => z.coerce.number({ error: `${what} must be a whole number.` }).int(`${what} must be a whole number.`);

export const pageQuerySchema = z.object({
  limit: whole('The limit').min(1, 'The limit is at least 1.').max(PAGE_MAX, `The limit is at most ${PAGE_MAX}.`).default(PAGE_DEFAULT),
  cursor: z.string().min(1).max(200).optional(),
});

export const dossierListQuerySchema = pageQuerySchema.extend({
  /** Matches the title, the product name, the model number or the requirement's reference. */
  q: z
    .string()
    .trim()
    .max(200)
    .optional()
    .transform((v) => v || undefined),
  productId: whole('The product').positive('The product id is positive.').optional(),
  /** The status of the dossier's latest revision. */
  status: z.enum(revisionStatuses, 'Choose draft, in_review, approved or returned.').optional(),
});

export type PageQuery = z.infer<typeof pageQuerySchema>;
export type DossierListQuery = z.infer<typeof dossierListQuerySchema>;
/** What the app may send: every part optional, the server fills the defaults. */
export type DossierListFilter = Partial<Pick<DossierListQuery, 'q' | 'productId' | 'status'>>;
