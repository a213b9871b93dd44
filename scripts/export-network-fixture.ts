/**
 * Writes the demo network's recorded plots as fixtures/analysis/mixed-demo-network.csv, the data
 * R's reference fit reads (fixtures/analysis/r/mixed-models.R). Run once when the demo changes:
 *   npx tsx scripts/export-network-fixture.ts && (cd fixtures/analysis && Rscript r/mixed-models.R)
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { networkCsv } from '../db/seed/demo-network';
import { projectRoot } from '../server/env';

writeFileSync(path.join(projectRoot, 'fixtures/analysis/mixed-demo-network.csv'), networkCsv());
