import { z } from 'zod';
import { designDraftSchema, requirementSchema } from './discharge';

export const revisionStatuses = ['draft', 'in_review', 'approved', 'returned'] as const;
export type RevisionStatus = (typeof revisionStatuses)[number];

export const STATUS_WORDS: Record<RevisionStatus, string> = {
  draft: 'Draft',
  in_review: 'Awaiting review',
  approved: 'Approved',
  returned: 'Returned for changes',
};

export const productCreateSchema = z.object({
  name: z.string().trim().min(1, 'Enter the product name.').max(200),
  modelNumber: z.string().trim().min(1, 'Enter the model number.').max(100),
  description: z.string().trim().max(4000).default(''),
});

export const dossierCreateSchema = z.object({
  productId: z.number({ error: 'Choose a product.' }).int().positive(),
  title: z.string().trim().min(1, 'Enter a title.').max(200),
  requirement: requirementSchema,
});

export const revisionCreateSchema = z.object({
  fromRevisionId: z.number().int().positive().optional(),
});

export const NOTES_MAX = 100_000;

/** The revision version a write was based on (optimistic concurrency). */
export const versionSchema = z.number({ error: 'Send the version of the revision you last read.' }).int().positive();

export const revisionPatchSchema = z
  .object({
    version: versionSchema,
    design: designDraftSchema.optional(),
    notes: z.string().max(NOTES_MAX, `Notes are limited to ${NOTES_MAX} characters.`).optional(),
  })
  .refine((v) => v.design !== undefined || v.notes !== undefined, 'Send design, notes or both.');

export const submitSchema = z.object({ version: versionSchema.optional() });

export const decisionSchema = z
  .object({
    decision: z.enum(['approve', 'return'], 'Choose approve or return.'),
    comment: z.string().trim().max(10_000).default(''),
    // Approving is a signature: the reviewer re-enters their password (checked by the server, never stored).
    password: z.string().max(200).optional(),
  })
  .superRefine((v, ctx) => {
    if (v.decision === 'return' && v.comment.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['comment'], message: 'Say what must change when you return a revision.' });
    }
  });

export const reviewCommentSchema = z.object({ body: z.string().trim().min(1, 'Write a comment.').max(10_000) });

export type ProductCreate = z.infer<typeof productCreateSchema>;
export type DossierCreate = z.infer<typeof dossierCreateSchema>;
export type RevisionPatch = z.infer<typeof revisionPatchSchema>;
export type Decision = z.infer<typeof decisionSchema>;
