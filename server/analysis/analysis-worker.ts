/**
 * The analysis run in a worker thread (see analysis-pool.ts), so a large or awkward sheet
 * never holds up other requests. Kept a plain module whose default export the pool calls; it
 * imports only the pure engine.
 */
import type { MessagePort } from 'node:worker_threads';
import {
  AnalysisInputError,
  AnalysisLimitError,
  analyzeCsv,
  analyzePlotRows,
  analyzeTwoFactorRows,
  type AnalysisResult,
  type AnalyzeCsvOptions,
  type AnalyzeOptions,
  type PlotRow,
  type TwoFactorResult,
} from './engine/analyze.js';

export type AnalysisTask = (
  | { kind: 'csv'; csv: string; options: AnalyzeCsvOptions }
  | { kind: 'rows'; rows: PlotRow[]; options: AnalyzeOptions }
  | {
      kind: 'two-factor';
      rows: PlotRow[];
      options: AnalyzeOptions & { splitPlot: boolean; factor: string };
    }
) & {
  /** Told when the thread starts on the task (the pool's time limit starts then). */
  started?: MessagePort;
};

/** Errors cross the thread boundary as plain data, so the caller can tell them apart. */
export type AnalysisOutcome =
  | { ok: true; result: AnalysisResult | TwoFactorResult }
  | { ok: false; kind: 'input'; message: string }
  | {
      ok: false;
      kind: 'limit';
      limit: AnalysisLimitError['limit'];
      max: number;
      actual: number;
      message: string;
    };

export default function runAnalysis(task: AnalysisTask): AnalysisOutcome {
  task.started?.postMessage('started');
  try {
    const result =
      task.kind === 'csv'
        ? analyzeCsv(task.csv, task.options)
        : task.kind === 'two-factor'
          ? analyzeTwoFactorRows(task.rows, task.options)
          : analyzePlotRows(task.rows, task.options);
    return { ok: true, result };
  } catch (err) {
    if (err instanceof AnalysisLimitError)
      return {
        ok: false,
        kind: 'limit',
        limit: err.limit,
        max: err.max,
        actual: err.actual,
        message: err.message,
      };
    if (err instanceof AnalysisInputError)
      return { ok: false, kind: 'input', message: err.message };
    throw err;
  }
}
