/** `npm start`: build when needed, then run the production server (it migrates and seeds by itself). */
import { buildIfNeeded } from './build';
import { main } from './index';

buildIfNeeded();
await main();
