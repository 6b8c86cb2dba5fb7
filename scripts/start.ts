// `npm start`: build the web export when it is missing, then run the server (which migrates and,
// outside production, seeds the demo scenario into an empty database).
import { existsSync } from 'node:fs';
import { buildWeb } from './build-web';

if (!existsSync('dist/index.html')) {
  console.log('Building the web app (first start only, about a minute)…');
  buildWeb();
}
await import('../server/index');
