// Knex CLI entry (e.g. `npx knex --knexfile knexfile.ts migrate:status`); the server migrates itself on start.
import { databaseFile, knexConfig } from './server/db/knex';

export default knexConfig(databaseFile(process.env.VOLTFALL_DATA_DIR ?? './data'));
