/**
 * The import rules in eslint.config.js, checked with ESLint's own Node API: each forbidden
 * import in a small file is reported, and an allowed one is not.
 */
import path from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const eslint = new ESLint({ ignore: false });

async function ruleIds(filePath: string, code: string) {
  const [result] = await eslint.lintText(code, { filePath: path.resolve(filePath) });
  return result!.messages.map((m) => m.ruleId);
}

describe('the lint rules on imports', { timeout: 60_000 }, () => {
  it.each([
    [
      'src never imports server/',
      'src/features/records/lint-probe.ts',
      "import '../../../server/app';",
    ],
    ['src never imports db/', 'src/lib/lint-probe.ts', "import '../../db/schema';"],
    ['src/app never imports db/', 'src/app/lint-probe.ts', "import '../../db/database';"],
    [
      'a feature never imports db/',
      'src/features/records/lint-probe.ts',
      "import '../../../db/schema';",
    ],
    [
      'the server never imports the client',
      'server/records/lint-probe.ts',
      "import '../../src/lib/api-client';",
    ],
    ['common never imports src/', 'common/lint-probe.ts', "import '../src/lib/session';"],
    ['common never imports the @ alias', 'common/lint-probe.ts', "import '@/lib/session';"],
    ['common never imports server/', 'common/lint-probe.ts', "import '../server/env';"],
    ['common never imports db/', 'common/contracts/lint-probe.ts', "import '../../db/schema';"],
    [
      'a server feature never reads another feature’s repository',
      'server/records/lint-probe.ts',
      "import { findTrialBySlug } from '../trials/trials-repository';",
    ],
    [
      'nor from a folder below it',
      'server/analysis/engine/lint-probe.ts',
      "import '../../trials/trials-repository';",
    ],
    [
      'a feature never reaches into another feature',
      'src/features/records/lint-probe.ts',
      "import '@/features/photos/api/photo-keys';",
    ],
    [
      'shared client code never imports a feature',
      'src/lib/lint-probe.ts',
      "import '@/features/records/api/record-api';",
    ],
  ])('%s', async (_name, file, code) => {
    expect(await ruleIds(file, `${code}\n`)).toContain('no-restricted-imports');
  });

  it('allows the ways that are meant', async () => {
    for (const [file, code] of [
      [
        'server/records/lint-probe.ts',
        "import './records-repository';\nimport '../trials/trials-service';",
      ],
      ['src/features/records/lint-probe.ts', "import '@common/decimal';\nimport '@/lib/session';"],
      ['common/lint-probe.ts', "import './units';"],
    ] as const) {
      expect(await ruleIds(file, `${code}\n`)).toEqual([]);
    }
  });

  it('reports an import cycle (fixtures/lint/cycle)', async () => {
    const results = await eslint.lintFiles(['fixtures/lint/cycle/first.ts']);
    expect(results[0]!.messages.map((m) => m.ruleId)).toContain('import-x/no-cycle');
  });
});
