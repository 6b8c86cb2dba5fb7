import type { Knex } from 'knex';
import type { ProductCreate } from '../../shared/schema/workflow';

type Db = Knex | Knex.Transaction;

interface ProductRow {
  id: number;
  name: string;
  model_number: string;
  description: string;
  created_at: string;
}

export interface ProductView {
  id: number;
  name: string;
  modelNumber: string;
  description: string;
  createdAt: string;
}

const toProduct = (r: ProductRow): ProductView => ({
  id: r.id,
  name: r.name,
  modelNumber: r.model_number,
  description: r.description,
  createdAt: r.created_at,
});

/** Counts only dossiers with an approved revision, for a viewer (they see approved work only). */
const APPROVED_DOSSIER = "EXISTS (SELECT 1 FROM revision seen WHERE seen.dossier_id = dossier.id AND seen.status = 'approved')";

/** Every product by name, each with how many dossiers it has (one grouped count over the product index). */
export async function listProducts(db: Db, approvedOnly = false): Promise<Array<ProductView & { dossierCount: number }>> {
  const counted = db('dossier').count('*').whereRaw('dossier.product_id = product.id');
  if (approvedOnly) counted.whereRaw(APPROVED_DOSSIER);
  const rows: Array<ProductRow & { dossier_count: number }> = await db('product').select('product.*', counted.as('dossier_count')).orderBy('name');
  return rows.map((r) => ({ ...toProduct(r), dossierCount: Number(r.dossier_count) }));
}

export async function findProduct(db: Db, id: number): Promise<ProductView | null> {
  const row: ProductRow | undefined = await db('product').where({ id }).first();
  return row ? toProduct(row) : null;
}

export async function productDossiers(db: Db, productId: number, approvedOnly = false): Promise<Array<{ id: number; title: string }>> {
  const query = db('dossier').where({ product_id: productId }).orderBy('id').select('id', 'title');
  return approvedOnly ? query.whereRaw(APPROVED_DOSSIER) : query;
}

export async function insertProduct(trx: Knex.Transaction, input: ProductCreate, createdBy: string): Promise<number> {
  const [row] = await trx('product')
    .insert({
      name: input.name,
      model_number: input.modelNumber,
      description: input.description,
      created_by: createdBy,
      created_at: new Date().toISOString(),
    })
    .returning('id');
  return row.id as number;
}
