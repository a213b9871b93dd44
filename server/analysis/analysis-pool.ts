/**
 * The worker threads the analyses run on. One pool per process, started on first use; extra
 * threads end when idle, and no thread keeps the process alive. Each analysis has a time limit
 * (the thread running it is stopped when it passes) and a memory limit of its own, and the
 * sheet's rows and entries are checked against their limits before any arithmetic.
 */
import os from 'node:os';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { AnalysisOutcome, AnalysisTask } from './analysis-worker';

export const analysisLimits = {
  /** Data rows (spreadsheet rows or plot values) per analysis. */
  maxRows: 20_000,
  /** Entries (varieties) per analysis: ANOVA and letters grow with their square. */
  maxEntries: 400,
  /** Heap of one analysis thread. */
  memoryMb: 512,
} as const;

/** Wall-clock time per analysis (ANALYSIS_TIME_LIMIT_MS, set by the runtime). */
let timeLimitMs = 10_000;
export function setAnalysisTimeLimit(ms: number) {
  timeLimitMs = ms;
}

/** Why an analysis did not finish; the router turns each into its answer. */
export class AnalysisStopped extends Error {
  constructor(
    readonly reason: 'time' | 'memory' | 'busy',
    message: string,
    /** The limit passed: milliseconds or megabytes. */
    readonly max: number | null = null,
  ) {
    super(message);
    this.name = 'AnalysisStopped';
  }
}

// From source (tsx, vitest) the worker is the .ts file and needs tsx's loader in its thread;
// from a build it is the compiled .js beside this module.
const fromSource = import.meta.url.endsWith('.ts');
const workerFile = new URL(
  fromSource ? './analysis-worker.ts' : './analysis-worker.js',
  import.meta.url,
);
const loaderArgs =
  fromSource && !process.execArgv.some((a) => a.includes('tsx')) ? ['--import', 'tsx'] : [];

let pool: Piscina<AnalysisTask, AnalysisOutcome> | null = null;

function thePool() {
  pool ??= new Piscina<AnalysisTask, AnalysisOutcome>({
    filename: workerFile.href,
    // One thread kept ready (and replaced when a time limit stops one), so a thread's start-up
    // is not counted against an analysis's time.
    minThreads: 1,
    // Leave a core for the request thread.
    maxThreads: Math.max(1, os.availableParallelism() - 1),
    idleTimeout: 30_000,
    // Beyond this many waiting analyses the caller is told to come back (503).
    maxQueue: 32,
    resourceLimits: { maxOldGenerationSizeMb: analysisLimits.memoryMb },
    ...(loaderArgs.length > 0 ? { execArgv: [...process.execArgv, ...loaderArgs] } : {}),
  });
  return pool;
}

/** How long an analysis may wait for a thread (queued, or a thread starting) before its own time. */
const START_GRACE_MS = 30_000;

export async function runAnalysis(task: AnalysisTask): Promise<AnalysisOutcome> {
  const p = thePool();
  const timeMs = timeLimitMs;
  // The clock starts when a thread takes the task (it says so on this port): time spent
  // waiting in the queue or for a thread to start is not the analysis's own.
  const { port1, port2 } = new MessageChannel();
  const stop = new AbortController();
  let timer = setTimeout(() => stop.abort(), timeMs + START_GRACE_MS);
  port1.once('message', () => {
    clearTimeout(timer);
    timer = setTimeout(() => stop.abort(), timeMs);
  });
  const limited = {
    ...task,
    options: {
      ...task.options,
      limits: { maxRows: analysisLimits.maxRows, maxEntries: analysisLimits.maxEntries },
    },
    started: port2,
  } as AnalysisTask;
  try {
    return await p.run(limited, { signal: stop.signal, transferList: [port2] });
  } catch (err) {
    const e = err as { name?: string; code?: string; message?: string };
    if (stop.signal.aborted || e?.name === 'AbortError')
      throw new AnalysisStopped(
        'time',
        `The analysis took longer than the time limit of ${timeMs / 1000} s and was stopped.`,
        timeMs,
      );
    if (e?.code === 'ERR_WORKER_OUT_OF_MEMORY')
      throw new AnalysisStopped(
        'memory',
        `The analysis needed more than the memory limit of ${analysisLimits.memoryMb} MB and was stopped.`,
        analysisLimits.memoryMb,
      );
    if (/queue is at limit/i.test(e?.message ?? ''))
      throw new AnalysisStopped('busy', 'Too many analyses are waiting; try again in a moment.');
    throw err;
  } finally {
    clearTimeout(timer);
    port1.close();
  }
}

/** Ends the threads (at shutdown; a later analysis starts a new pool). */
export async function closeAnalysisPool(): Promise<void> {
  const p = pool;
  pool = null;
  await p?.destroy();
}
