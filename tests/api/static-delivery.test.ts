/**
 * How the built client and text answers travel: compressed when the browser accepts it, hashed
 * assets cached for good, the shell and the service worker re-checked on every visit.
 * Header meanings: RFC 9110 §8.4 (Content-Encoding) and RFC 9111 §5.2.2 with RFC 8246 (immutable).
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/test-app';

let t: TestApp;
let clientDir: string;
const script = `export const rows = [${Array.from({ length: 400 }, (_, i) => `"row ${i}"`).join(',')}];\n`;

beforeAll(async () => {
  clientDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-client-'));
  fs.mkdirSync(path.join(clientDir, 'assets'));
  fs.writeFileSync(path.join(clientDir, 'index.html'), '<!doctype html><title>Rowtally</title>');
  fs.writeFileSync(path.join(clientDir, 'assets', 'index-3f2a9c1d.js'), script);
  fs.writeFileSync(path.join(clientDir, 'sw.js'), 'self.addEventListener("fetch", () => {});');
  t = await createTestApp({ clientDir });
});
afterAll(async () => {
  await t.close();
  fs.rmSync(clientDir, { recursive: true, force: true });
});

describe('built assets', () => {
  it('are sent gzip-compressed to a browser that accepts it, and the bytes come back whole', async () => {
    // Read the bytes off the wire: a client library would inflate them before we saw them.
    const server = t.app.listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    const { port } = server.address() as AddressInfo;
    const { headers, body } = await new Promise<{
      headers: http.IncomingHttpHeaders;
      body: Buffer;
    }>((resolve, reject) => {
      http
        .get(
          {
            host: '127.0.0.1',
            port,
            path: '/assets/index-3f2a9c1d.js',
            headers: { 'Accept-Encoding': 'gzip' },
          },
          (res) => {
            const parts: Buffer[] = [];
            res.on('data', (c: Buffer) => parts.push(c));
            res.on('end', () => resolve({ headers: res.headers, body: Buffer.concat(parts) }));
          },
        )
        .on('error', reject);
    });
    server.close();
    expect(headers['content-encoding']).toBe('gzip');
    expect(body.length).toBeLessThan(Buffer.byteLength(script) / 3);
    expect(zlib.gunzipSync(body).toString()).toBe(script);
  });

  it('are sent as they are to a client that asks for no encoding', async () => {
    const res = await request(t.app)
      .get('/assets/index-3f2a9c1d.js')
      .set('Accept-Encoding', 'identity');
    expect(res.headers['content-encoding']).toBeUndefined();
    expect(res.text).toBe(script);
  });

  it('carry a hash in their name and are cached for a year without revalidation', async () => {
    const res = await request(t.app).get('/assets/index-3f2a9c1d.js');
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
  });

  it('leave the service worker and the app shell to be re-checked on every visit', async () => {
    const sw = await request(t.app).get('/sw.js');
    expect(sw.headers['cache-control']).toBe('no-cache');
    const shell = await request(t.app).get('/trials');
    expect(shell.headers['cache-control']).toBe('no-cache');
  });
});
