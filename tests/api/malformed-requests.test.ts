/**
 * Client mistakes are answered 4xx with the error shape, never 5xx: each known way a
 * request can be malformed (body parser and router refusals, NUL characters, broken multipart
 * forms), then a property test that sends generated malformed requests to every mounted route
 * family (the route list the authorization matrix uses) as a signed-in lead and as a stranger
 * who is signed out. Runs are bounded so the file finishes well inside a minute.
 */
import zlib from 'node:zlib';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiMounts } from '../../server/app';
import { listRoutes } from '../../server/lib/route-list';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

let t: TestApp;
let lead: string;
let slug: string;

beforeAll(async () => {
  t = await createTestApp();
  lead = await mintSessionCookie(t, await createUser(t.db, { name: 'Wren Halloway' }));
  const created = await request(t.app)
    .post('/api/trials')
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', lead)
    .send({ title: 'Odd Input Beans', crop: 'Bush bean', season: '2026', design: 'crd' });
  expect(created.status).toBe(201);
  slug = created.body.slug;
}, 60_000);
afterAll(async () => {
  await t.close();
});

function expectClientError(res: request.Response) {
  expect(res.status, `${res.status} ${res.text.slice(0, 200)}`).toBeGreaterThanOrEqual(400);
  expect(res.status, `${res.status} ${res.text.slice(0, 200)}`).toBeLessThan(500);
}

describe('each known malformed request is a 4xx', () => {
  const patch = () =>
    request(t.app).patch('/api/me').set('Origin', TEST_ORIGIN).set('Cookie', lead);

  it('an unsupported charset is 415', async () => {
    const res = await patch()
      .set('Content-Type', 'application/json; charset=iso-8859-1')
      .send('{"name":"Wren"}');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
  });

  it('an unknown Content-Encoding is 415', async () => {
    const res = await patch()
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'snappy')
      .send('{"name":"Wren"}');
    expect(res.status).toBe(415);
  });

  it('a gzip body that does not inflate is 400', async () => {
    const broken = zlib.gzipSync('{"name":"Wren"}').subarray(0, 12);
    const res = await patch()
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'gzip')
      .send(broken);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
  });

  it('a malformed percent-escape in the path is 400', async () => {
    const res = await request(t.app).get('/api/trials/%E0%A4%A').set('Cookie', lead);
    expect(res.status).toBe(400);
  });

  it('a NUL in a JSON text field is 400 naming the field', async () => {
    const res = await patch().send({ name: 'Wren\u0000Halloway' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields).toEqual([
      { path: 'body.name', message: 'Text cannot contain a NUL character (code 0).' },
    ]);
  });

  it('a NUL in the path or the query is 400', async () => {
    expect((await request(t.app).get(`/api/trials/${slug}%00`).set('Cookie', lead)).status).toBe(
      400,
    );
    expect(
      (await request(t.app).get(`/api/trials/${slug}/photos?site=a%00b`).set('Cookie', lead))
        .status,
    ).toBe(400);
  });

  it("a NUL sent to the sign-in library's routes is refused before it reaches them", async () => {
    const update = await request(t.app)
      .post('/api/auth/update-user')
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', lead)
      .send({ name: 'Wren\u0000' });
    expect(update.status).toBe(400);
    expect(update.body.error.code).toBe('validation_failed');
    const signIn = await request(t.app)
      .post('/api/auth/sign-in/email')
      .set('Origin', TEST_ORIGIN)
      .send({ email: 'wren@test.example', password: 'pass\u0000word-long' });
    expect(signIn.status).toBe(400);
  });

  it('a broken multipart form is 400', async () => {
    const noBoundary = await request(t.app)
      .post(`/api/trials/${slug}/photos`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', lead)
      .set('Content-Type', 'multipart/form-data')
      .send('nothing here');
    expectClientError(noBoundary);
    const truncated = await request(t.app)
      .post(`/api/trials/${slug}/photos`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', lead)
      .set('Content-Type', 'multipart/form-data; boundary=XyZ')
      .send('--XyZ\r\nContent-Disposition: form-data; name="photo"; filename="a.jpg"\r\n\r\nabc');
    expect(truncated.status).toBe(400);
  });
});

type Malformed =
  | { kind: 'bad-json'; text: string }
  | { kind: 'wrong-types'; body: unknown }
  | { kind: 'nul'; text: string }
  | { kind: 'bad-charset'; charset: string }
  | { kind: 'bad-encoding'; encoding: string; bytes: Uint8Array }
  | { kind: 'bad-multipart'; body: string; boundary: string | null }
  | { kind: 'bad-escape'; escape: string };

const hugeNumber = fc.constantFrom(1e308, -1e308, 2 ** 53 + 1, 1e-320, Number.MAX_SAFE_INTEGER);
const oddValue = fc.oneof(
  fc.string(),
  hugeNumber,
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.integer(), { maxLength: 3 }),
  fc.constant('9'.repeat(400)),
);
const malformed: fc.Arbitrary<Malformed> = fc.oneof(
  fc.record({
    kind: fc.constant('bad-json' as const),
    text: fc.constantFrom('{', '{"a":', '[1,', '{"a":1}}', 'nul', '\u0000'),
  }),
  fc.record({
    kind: fc.constant('wrong-types' as const),
    body: fc.oneof(
      fc.dictionary(
        fc.constantFrom('name', 'title', 'trait', 'alpha', 'csv', 'value', 'date', 'id', 'entries'),
        oddValue,
        { maxKeys: 4 },
      ),
      fc.array(oddValue, { maxLength: 3 }),
    ),
  }),
  fc.record({
    kind: fc.constant('nul' as const),
    text: fc.string({ maxLength: 8 }).map((s) => `${s}\u0000${s}`),
  }),
  fc.record({
    kind: fc.constant('bad-charset' as const),
    charset: fc.constantFrom('utf-7', 'latin9x', 'ebcdic', ''),
  }),
  fc.record({
    kind: fc.constant('bad-encoding' as const),
    encoding: fc.constantFrom('gzip', 'deflate', 'br', 'snappy', 'gzip, gzip'),
    bytes: fc.uint8Array({ minLength: 1, maxLength: 32 }),
  }),
  fc.record({
    kind: fc.constant('bad-multipart' as const),
    body: fc.constantFrom('--B\r\n', '--B\r\nContent-Disposition: form-data\r\n\r\nx', 'junk'),
    boundary: fc.constantFrom('B', null, ''),
  }),
  fc.record({
    kind: fc.constant('bad-escape' as const),
    escape: fc.constantFrom('%', '%E0%A4%A', '%ZZ', '%00', '%C0%AF', '%FF%FE'),
  }),
);

describe('malformed requests to every route family never get a 5xx', () => {
  it('holds for generated requests, signed in and signed out', async () => {
    const routes = listRoutes(apiMounts(t.runtime.deps)).concat(
      ['/api/auth/sign-in/email', '/api/auth/sign-up/email', '/api/auth/update-user'].map(
        (path) => ({ method: 'POST', path }),
      ),
    );
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...routes),
        malformed,
        fc.boolean(),
        async (route, bad, signedIn) => {
          let path = route.path
            .replace(':slug', slug)
            .replace(/:(\w+)/g, '00000000-0000-4000-8000-000000000000');
          if (bad.kind === 'bad-escape') path = path.replace(/\/([^/]*)$/, `/$1${bad.escape}`);
          if (bad.kind === 'nul') path += `?q=${encodeURIComponent(bad.text)}`;
          const method = route.method.toLowerCase() as 'post';
          let req = request(t.app)[method](path).set('Origin', TEST_ORIGIN);
          if (signedIn) req = req.set('Cookie', lead);
          let res: request.Response;
          switch (bad.kind) {
            case 'bad-json':
              res = await req.set('Content-Type', 'application/json').send(bad.text);
              break;
            case 'wrong-types':
              res = await req.send(bad.body as object);
              break;
            case 'nul':
              res = await req.send({ name: bad.text, title: bad.text, csv: bad.text });
              break;
            case 'bad-charset':
              res = await req
                .set('Content-Type', `application/json; charset=${bad.charset}`)
                .send('{"name":"x"}');
              break;
            case 'bad-encoding':
              res = await req
                .set('Content-Type', 'application/json')
                .set('Content-Encoding', bad.encoding)
                .send(Buffer.from(bad.bytes));
              break;
            case 'bad-multipart':
              res = await req
                .set(
                  'Content-Type',
                  bad.boundary === null
                    ? 'multipart/form-data'
                    : `multipart/form-data; boundary=${bad.boundary}`,
                )
                .send(bad.body);
              break;
            case 'bad-escape':
              res = await req;
              break;
          }
          expect(
            res.status,
            `${route.method} ${path} (${bad.kind}) → ${res.status} ${res.text.slice(0, 200)}`,
          ).toBeLessThan(500);
        },
      ),
      { numRuns: 250, seed: 20261202 },
    );
  }, 50_000);
});
