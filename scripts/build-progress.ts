/**
 * A long build run as a child process with a line every few seconds, so a slow machine does not
 * look stuck: "Building the client…", "  still building the client… 10 s", "Client built in 31 s."
 */
import { type ChildProcess, spawn } from 'node:child_process';

export function buildWithProgress(o: {
  /** What is built, as the lines say it: "the client". */
  what: string;
  command: string;
  args: string[];
  everyMs?: number;
  log?: (line: string) => void;
  /** Given the child as soon as it runs (so a shutdown can stop it). */
  onSpawn?: (child: ChildProcess) => void;
}): Promise<void> {
  const log = o.log ?? console.log;
  const noun = o.what.replace(/^the /, '');
  const Noun = noun.charAt(0).toUpperCase() + noun.slice(1);
  log(`Building ${o.what}…`);
  const began = Date.now();
  const seconds = () => Math.round((Date.now() - began) / 1000);
  return new Promise((resolve, reject) => {
    const build = spawn(o.command, o.args, { stdio: 'inherit' });
    o.onSpawn?.(build);
    const ticker = setInterval(
      () => log(`  still building ${o.what}… ${seconds()} s`),
      o.everyMs ?? 5000,
    );
    build.once('exit', (status, signal) => {
      clearInterval(ticker);
      if (status === 0) {
        log(`${Noun} built in ${seconds()} s.`);
        resolve();
      } else reject(new Error(`The ${noun} build failed (${signal ?? `exit ${status}`}).`));
    });
    build.once('error', (err) => {
      clearInterval(ticker);
      reject(err);
    });
  });
}
