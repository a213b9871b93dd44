/**
 * The start log while the client builds: a line at the start, one every few seconds while the
 * build runs, and one at the end; a failed build is an error naming how it ended. The build here
 * is a stand-in child process that takes about a second (the real one is the same spawn).
 */
import { describe, expect, it } from 'vitest';
import { buildWithProgress } from '../../scripts/build-progress';

const slowChild = (ms: number, exitCode = 0) => [
  '-e',
  `setTimeout(() => process.exit(${exitCode}), ${ms})`,
];

describe('build progress in the start log', () => {
  it('says it is building, that it is still building every interval, and when it is done', async () => {
    const lines: string[] = [];
    let spawned = false;
    await buildWithProgress({
      what: 'the client',
      command: process.execPath,
      args: slowChild(1300),
      everyMs: 250,
      log: (line) => lines.push(line),
      onSpawn: (child) => (spawned = child.pid !== undefined),
    });
    expect(spawned).toBe(true);
    expect(lines[0]).toBe('Building the client…');
    const still = lines.filter((l) => /^ {2}still building the client… \d+ s$/.test(l));
    // About 1.3 s at one line per 0.25 s: several progress lines (a busy machine may take longer).
    expect(still.length).toBeGreaterThanOrEqual(3);
    expect(lines.at(-1)).toMatch(/^Client built in \d+ s\.$/);
    expect(lines).toHaveLength(still.length + 2);
  });

  it('a failed build rejects with how it ended, and the progress lines stop', async () => {
    const lines: string[] = [];
    await expect(
      buildWithProgress({
        what: 'the client',
        command: process.execPath,
        args: slowChild(100, 3),
        everyMs: 50,
        log: (line) => lines.push(line),
      }),
    ).rejects.toThrow('The client build failed (exit 3).');
    const count = lines.length;
    await new Promise((resolve) => setTimeout(resolve, 200));
    expect(lines).toHaveLength(count);
  });
});
