import type { DossierCreate } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { findProduct } from '../products/store';
import { createDraft } from '../revisions/domain';
import { dossierWithRevisions, insertDossier } from './store';

/** createDossier: assert the product exists, store the dossier with its audit event, open revision 1 as an empty draft. */
export async function createDossier(ctx: AppContext, user: SignedInUser, input: DossierCreate) {
  const product = await findProduct(ctx.db, input.productId);
  if (!product) throw new AppError(400, 'invalid_input', 'The product does not exist.', [{ path: 'productId', message: 'no such product' }]);
  const id = await ctx.db.transaction(async (trx) => {
    const dossierId = await insertDossier(trx, { productId: product.id, title: input.title, requirement: input.requirement, createdBy: user.id });
    await appendAudit(trx, { actorId: user.id, action: 'dossier.create', subjectType: 'dossier', subjectId: dossierId, dossierId, payload: input });
    return dossierId;
  });
  // Revision 1 starts as an empty draft so the author can go straight to the design.
  await createDraft(ctx, user, id);
  return dossierWithRevisions(ctx.db, id);
}
