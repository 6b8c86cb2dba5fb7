import type { Knex } from 'knex';

/** Demo products of the invented Fennel Grid Labs; dossiers are added as the workflow lands. */
export async function seedDemoDossiers(trx: Knex.Transaction, ids: Record<string, string>): Promise<void> {
  const now = new Date().toISOString();
  await trx('product').insert([
    {
      name: 'Heron 1000 string inverter',
      model_number: 'FGL-HS1000-3P',
      description: '1000 V DC solar string inverter, three-phase output, 60 kW.',
      created_by: ids.engineer,
      created_at: now,
    },
    {
      name: 'Wren 400 servo drive',
      model_number: 'FGL-WD400-7K5',
      description: '400 V three-phase servo drive, 7.5 kW, DC link with film and electrolytic capacitors.',
      created_by: ids.engineer,
      created_at: now,
    },
  ]);
}
