/**
 * The production server (`npm run start:prod`, built to dist/server/main.js by `npm run build`);
 * what it does and refuses is in server/production.ts.
 */
import { runProduction } from './production';

runProduction();
