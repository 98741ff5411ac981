import { existsSync, readFileSync } from 'node:fs';

/** Add up vitest's JSON report: every suite (unit, api, worker, cli, browser) is in it. */
export function summarise(reportFile: string): { passed: number; failed: number } {
  if (!existsSync(reportFile)) return { passed: 0, failed: 1 };
  const report = JSON.parse(readFileSync(reportFile, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    testResults?: { status: string; assertionResults: unknown[] }[];
  };
  // A file that failed to load has no assertions but counts as a failure.
  const brokenFiles = (report.testResults ?? []).filter((f) => f.status === 'failed' && f.assertionResults.length === 0).length;
  return { passed: report.numPassedTests, failed: report.numFailedTests + brokenFiles };
}
