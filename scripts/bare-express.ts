// The reference the server benchmark measures against: Express answering a small JSON body, nothing
// else (no logging, no session, no parsing). Prints its port on stdout. Used by bench-server.ts.
import type { AddressInfo } from 'node:net';
import express from 'express';

const app = express();
app.get('/json', (_req, res) => {
  res.json({ ok: true, at: Date.now() });
});
const server = app.listen(0, '127.0.0.1', () => {
  process.stdout.write(`${(server.address() as AddressInfo).port}\n`);
});
process.once('SIGTERM', () => server.close(() => process.exit(0)));
