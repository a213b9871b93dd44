/**
 * The closing line of `npm test` against Vitest's own JSON report (fixtures/test-runner: the
 * reporter's output for a run where one file does not load).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { summarizeTestRun, type VitestJsonReport } from '../../scripts/test-summary';

const report = JSON.parse(
  readFileSync(path.resolve('fixtures/test-runner/vitest-4.1-load-failure.json'), 'utf8'),
) as VitestJsonReport;

describe('the closing line of the test command', () => {
  it('counts a file that did not load as a failure and fails the run', () => {
    const summary = summarizeTestRun(report);
    expect(summary.ok).toBe(false);
    expect(summary.line).toBe(
      'Tests: 1 passed, 1 failed (1 test file failed outside any test: did not load, or a hook failed), 1 skipped — FAILED',
    );
    expect(summary.brokenFiles).toEqual([
      {
        name: '<repo>/tests/unit/tmpbroken/broken.test.ts',
        message: expect.stringContaining("Cannot find module './does-not-exist'"),
      },
    ]);
  });

  it('passes a run the runner calls a success', () => {
    const passing: VitestJsonReport = {
      ...report,
      success: true,
      numFailedTestSuites: 0,
      testResults: report.testResults.filter((f) => f.status === 'passed'),
    };
    expect(summarizeTestRun(passing)).toEqual({
      line: 'Tests: 1 passed, 0 failed, 1 skipped',
      ok: true,
      brokenFiles: [],
    });
  });

  it('fails a run the runner failed with no failed test or file, and a run with no report', () => {
    const odd: VitestJsonReport = {
      ...report,
      testResults: report.testResults.filter((f) => f.status === 'passed'),
    };
    expect(summarizeTestRun(odd)).toMatchObject({
      ok: false,
      line: 'Tests: 1 passed, 0 failed, 1 skipped; the run reported errors outside the tests — FAILED',
    });
    expect(summarizeTestRun(null).ok).toBe(false);
  });
});
