// Run as a separate process by the PKI test: creates (or reads) the development PKI in the folder
// given and prints the root certificate's fingerprint.
import { fingerprint } from '../../server/signing/asn1';
import { loadOrCreateDevPki } from '../../server/signing/dev-pki';

const pki = await loadOrCreateDevPki(process.argv[2]);
console.log(fingerprint(pki.root.cert));
