import type { ProductCreate } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { findProduct, insertProduct, type ProductView } from './store';

/** createProduct: store the product and its audit event together. */
export async function createProduct(ctx: AppContext, user: SignedInUser, input: ProductCreate): Promise<ProductView> {
  const id = await ctx.db.transaction(async (trx) => {
    const productId = await insertProduct(trx, input, user.id);
    await appendAudit(trx, { actorId: user.id, action: 'product.create', subjectType: 'product', subjectId: productId, payload: input });
    return productId;
  });
  return (await findProduct(ctx.db, id))!;
}
