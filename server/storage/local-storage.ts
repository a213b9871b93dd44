import crypto from 'node:crypto';
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import { assertKey, type ObjectStorage } from './object-storage';

const typeByExtension: Record<string, string> = {
  '.webp': 'image/webp',
  '.jpg': 'image/jpeg',
  '.png': 'image/png',
  '.avif': 'image/avif',
};

/** Files in a folder on this server (the default; one server only). */
export function localStorage(root: string): ObjectStorage {
  const fileOf = (key: string) => {
    assertKey(key);
    return path.join(root, ...key.split('/'));
  };
  return {
    driver: 'local',
    async put(key, body) {
      const file = fileOf(key);
      await fsp.mkdir(path.dirname(file), { recursive: true });
      // Write beside, then rename: a reader never sees half a file.
      const temp = `${file}.${crypto.randomBytes(6).toString('hex')}.part`;
      try {
        await fsp.writeFile(temp, body, { mode: 0o640 });
        await fsp.rename(temp, file);
      } catch (err) {
        await fsp.rm(temp, { force: true });
        throw err;
      }
    },
    async get(key) {
      const file = fileOf(key);
      let size: number;
      try {
        const stat = await fsp.stat(file);
        if (!stat.isFile()) return null;
        size = stat.size;
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
      return {
        body: fs.createReadStream(file),
        size,
        contentType: typeByExtension[path.extname(file)] ?? 'application/octet-stream',
      };
    },
    async delete(key) {
      const file = fileOf(key);
      await fsp.rm(file, { force: true });
      // Tidy empty folders up to the root so deleted photos leave nothing behind.
      let dir = path.dirname(file);
      while (dir.startsWith(root) && dir !== root) {
        try {
          await fsp.rmdir(dir);
        } catch {
          break;
        }
        dir = path.dirname(dir);
      }
    },
    async list(prefix) {
      const out: string[] = [];
      const walk = async (dir: string, rel: string) => {
        let names: fs.Dirent[];
        try {
          names = await fsp.readdir(dir, { withFileTypes: true });
        } catch (err) {
          if ((err as NodeJS.ErrnoException).code === 'ENOENT') return;
          throw err;
        }
        for (const d of names) {
          const key = rel ? `${rel}/${d.name}` : d.name;
          if (d.isDirectory()) await walk(path.join(dir, d.name), key);
          else if (d.isFile() && !d.name.endsWith('.part') && key.startsWith(prefix)) out.push(key);
        }
      };
      await walk(root, '');
      return out.sort();
    },
    async check() {
      await fsp.mkdir(root, { recursive: true });
      await fsp.access(root, fs.constants.R_OK | fs.constants.W_OK);
    },
  };
}
