/**
 * The closing line of `npm test`, read from Vitest's JSON report. A file that fails outside
 * its tests (it does not load, or a hook throws) has no failed test in it, so the runner's own
 * success flag and its failed files are read as well: such a file is a failure too.
 */

export interface VitestJsonReport {
  success: boolean;
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests?: number;
  numFailedTestSuites: number;
  testResults: {
    name: string;
    status: string;
    message?: string;
    assertionResults: { status: string }[];
  }[];
}

export interface TestSummary {
  line: string;
  ok: boolean;
  /** Files that failed without a failing test, with the runner's message. */
  brokenFiles: { name: string; message: string }[];
}

export function summarizeTestRun(report: VitestJsonReport | null): TestSummary {
  if (!report) {
    return {
      line: 'Tests: no results (the test runner stopped before writing its report)',
      ok: false,
      brokenFiles: [],
    };
  }
  const brokenFiles = report.testResults
    .filter((f) => f.status === 'failed' && !f.assertionResults.some((a) => a.status === 'failed'))
    .map((f) => ({ name: f.name, message: f.message ?? '' }));
  const skipped = report.numPendingTests + (report.numTodoTests ?? 0);
  const failed = report.numFailedTests + brokenFiles.length;
  let failedText = `${failed} failed`;
  if (brokenFiles.length > 0) {
    const files = brokenFiles.length === 1 ? '1 test file' : `${brokenFiles.length} test files`;
    failedText += ` (${files} failed outside any test: did not load, or a hook failed)`;
  }
  let line = `Tests: ${report.numPassedTests} passed, ${failedText}, ${skipped} skipped`;
  if (!report.success && failed === 0) line += '; the run reported errors outside the tests';
  const ok = report.success && report.numFailedTests === 0 && report.numFailedTestSuites === 0;
  return { line: `${line}${ok ? '' : ' — FAILED'}`, ok, brokenFiles };
}
