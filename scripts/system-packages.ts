/** Installs the Debian packages a command needs when they are missing (as root), else says how. */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import { findPgBinDir } from '../db/pg-server';
import { NGINX_BIN } from './cluster/balancer';

const checks: Record<string, () => boolean> = {
  postgresql: () => findPgBinDir() !== null,
  chromium: () => fs.existsSync('/usr/bin/chromium'),
  'poppler-utils': () => fs.existsSync('/usr/bin/pdftotext'),
  nginx: () => fs.existsSync(NGINX_BIN),
};

export function ensureSystemPackages(names: (keyof typeof checks)[]): void {
  const missing = names.filter((n) => !checks[n]!());
  if (missing.length === 0) return;
  const command = `apt-get update && apt-get install -y --no-install-recommends ${missing.join(' ')}`;
  if (process.getuid?.() !== 0) {
    throw new Error(
      `Missing system packages: ${missing.join(', ')}. Install them with:\n  sudo sh -c '${command}'`,
    );
  }
  console.log(`Installing missing system packages: ${missing.join(', ')}…`);
  const result = spawnSync('sh', ['-c', command], {
    stdio: ['ignore', 'inherit', 'inherit'],
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  const still = missing.filter((n) => !checks[n]!());
  if (result.status !== 0 || still.length) {
    throw new Error(
      `Could not install ${still.join(', ') || missing.join(', ')} (apt-get exit ${result.status}).`,
    );
  }
}
