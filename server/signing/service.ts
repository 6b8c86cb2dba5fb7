// The signing setup of a running server: the organisation's identity in production (opened at
// start-up, so a bad file stops the server), or the development PKI with the local time-stamping
// authority on loopback elsewhere.
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { pem } from './asn1';
import { folderPkiStorage, loadOrCreateDevPkiIn } from './dev-pki';
import { databasePkiStorage } from './store';
import { developmentSetup, organisationSetup, type SigningSetup } from './identity';
import { startLocalTsa, type LocalTsa } from './local-tsa';

export interface Signing {
  /** Resolved once; in development the PKI is created on first use. */
  setup(): Promise<SigningSetup>;
  /** The trust anchors as a PEM bundle, for assessors' validators. */
  trustPem(): Promise<string>;
  /** The local time-stamping authority's URL, when this server runs one. */
  localTsaUrl: string | null;
  close(): Promise<void>;
}

/**
 * Outside production the development PKI is read (created on first use) from the data folder, or, on
 * PostgreSQL, from the database `db`: instances sharing it sign with one CA and one time-stamping key,
 * each answering time-stamp requests with its own local authority.
 */
export async function startSigning(config: Config, db?: Db): Promise<Signing> {
  const { p12Path, p12Password, chainPath, tsaUrl } = config.signing;
  if (p12Path) {
    const setup = organisationSetup({ p12Path, p12Password: p12Password ?? '', chainPath, tsaUrl: tsaUrl === 'none' ? null : tsaUrl });
    // Fail at start-up, not at the first approval.
    await setup;
    return build(() => setup, null);
  }
  if (config.production) {
    throw new Error('Signing in production needs the organisation’s PKCS#12 file (SIGNING_P12_PATH) and its password (SIGNING_P12_PASSWORD).');
  }
  const storage = config.databaseUrl && db ? databasePkiStorage(db, config.databaseUrl) : folderPkiStorage(config.dataDir);
  const pki = () => loadOrCreateDevPkiIn(storage);
  const localTsa = tsaUrl === null ? await startLocalTsa(async () => (await pki()).tsa) : null;
  const url = tsaUrl === 'none' ? null : (localTsa?.url ?? tsaUrl);
  let setup: Promise<SigningSetup> | null = null;
  return build(() => (setup ??= pki().then((p) => developmentSetup(p, url))), localTsa);
}

function build(setup: () => Promise<SigningSetup>, localTsa: LocalTsa | null): Signing {
  return {
    setup,
    async trustPem() {
      return (await setup()).trustAnchors.map((c) => pem('CERTIFICATE', c)).join('');
    },
    localTsaUrl: localTsa?.url ?? null,
    close: async () => localTsa?.close(),
  };
}
