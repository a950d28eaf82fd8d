import { type Batch, type Lot, type Material, type Person } from '@tareline/protocol';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PeopleRepository } from '../src/people/people.repository.js';
import { TokenService } from '../src/auth/token.service.js';
import { call, DEMO } from './support/auth-helpers.js';
import { rawRequest } from './support/raw-request.js';
import { registeredApiRoutes } from './support/registered-routes.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

/**
 * Every route the hub registers gets generated bad input — wrong types, control characters,
 * extreme numbers, 100 kB strings, 1000-deep nesting, malformed JSON, unknown fields, hostile
 * path segments — as an admin and as an operator. Whatever a client sends, the answer is a 4xx
 * (or a 2xx for input that happens to be valid), never a 5xx: a 500 is a bug.
 */

/** Fixed, so a failure is the same failure on every run. */
const SEED = 0x7a4e11;
const RANDOM_PROBES_PER_ROUTE = 20;

type Role = 'admin' | 'operator';

interface Probe {
  role: Role;
  path: string;
  body?: string;
  contentType?: string;
}

// ---- generated values ------------------------------------------------------------------------

/** Marks a JSON fragment to splice into the body as is (JSON.stringify cannot write these). */
const raw = (json: string) => `@@raw:${json}@@`;
const spliceRaw = (json: string) => json.replace(/"@@raw:([^"]*)@@"/g, '$1');

const nested = (depth: number, open: string, inner: string, close: string) =>
  open.repeat(depth) + inner + close.repeat(depth);
const DEEP_ARRAY = nested(1000, '[', '', ']');
const DEEP_OBJECT = nested(1000, '{"a":', '1', '}');

/** NUL most often: it is the one PostgreSQL refuses outright. */
const controlChar = fc.oneof(
  { weight: 3, arbitrary: fc.constant('\u0000') },
  fc.constantFrom(
    '\u0001',
    '\u0007',
    '\b',
    '\t',
    '\n',
    '\u000b',
    '\f',
    '\r',
    '\u001b',
    '\u007f',
    '\u0080',
    '\u0085',
    '\u009b',
    '\u009f',
  ),
);

const badText = fc.oneof(
  fc.constantFrom(
    '\u0000',
    'HR-1003\u0000',
    'bench-1\u0000',
    '\u001b[2J',
    'a\u007fb',
    'x\u0085y',
    '\ud800',
    'x\udfff',
    '\u202eevil',
    '',
    ' ',
    '..',
    '../../etc/passwd',
    'NaN',
    '-0',
    '1e308',
    '__proto__',
    'x'.repeat(100_000),
    'y'.repeat(50_000),
    '\u0000'.repeat(2_000),
  ),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc
    .tuple(fc.string({ maxLength: 8 }), controlChar, fc.string({ maxLength: 8 }))
    .map(([a, c, b]) => a + c + b),
);

const badNumber = fc.oneof(
  fc.constantFrom(
    raw('1e999'),
    raw('-1e999'),
    raw('-0'),
    1e308,
    -1e308,
    5e-324,
    2 ** 31,
    2 ** 53 + 2,
    -1,
    0,
    0.1 + 0.2,
  ),
  fc.double(),
  fc.integer(),
);

const badValue: fc.Arbitrary<unknown> = fc.oneof(
  badText,
  badNumber,
  fc.boolean(),
  fc.constant(null),
  fc.constantFrom(raw(DEEP_ARRAY), raw(DEEP_OBJECT), {}, []),
  fc.array(badText, { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 6 }), badText, { maxKeys: 3 }),
);

/** A path segment as it goes on the wire: already escaped, or hostile on purpose. */
function badSegment(realId: string): fc.Arbitrary<string> {
  const escaped = (s: string) => {
    try {
      return encodeURIComponent(s);
    } catch {
      return '%ED%A0%80'; // a lone surrogate, as UTF-8
    }
  };
  return fc.oneof(
    { weight: 4, arbitrary: fc.constant(realId) },
    fc.constantFrom(
      '%00',
      `${realId}%00`,
      '..',
      '%2e%2e',
      '.',
      '%1b%5b2J',
      '%7f',
      '%c2%85',
      '%ED%A0%80',
      '%',
      '%zz',
      '-0',
      '1e308',
      'NaN',
      'Infinity',
      '0x10',
      '9'.repeat(400),
      'x'.repeat(5_000),
      '__proto__',
      '%20',
    ),
    fc.string({ unit: 'binary', maxLength: 30 }).map(escaped),
    badText.map(escaped),
  );
}

const MALFORMED_JSON = [
  '',
  '{',
  '{"a":',
  '[1,]',
  "{'a':1}",
  'nul',
  '{"a":1}{',
  '"\\u0000"',
  'null',
  '-0',
  '1e999',
  '{"__proto__":{"role":"admin"}}',
  DEEP_ARRAY,
  DEEP_OBJECT,
];

type JsonPath = (string | number)[];

/** Paths to every value inside `value`, containers and leaves alike (`lots.0.code`). */
function pathsIn(value: unknown, prefix: JsonPath = []): JsonPath[] {
  if (value === null || typeof value !== 'object') return [prefix];
  const entries = Array.isArray(value)
    ? value.map((v, i) => [i, v] as const)
    : Object.entries(value);
  return [prefix, ...entries.flatMap(([key, v]) => pathsIn(v, [...prefix, key]))];
}

/** `root` with the value at `path` replaced (`undefined`: removed); `root` itself unchanged. */
function replaced(root: unknown, path: JsonPath, value: unknown): unknown {
  if (path.length === 0) return value;
  const copy = structuredClone(root) as Record<string | number, unknown>;
  let parent = copy;
  for (const key of path.slice(0, -1)) parent = parent[key] as Record<string | number, unknown>;
  const last = path.at(-1)!;
  if (value === undefined) delete parent[last];
  // defineProperty, so a key named `__proto__` becomes a real field of the body.
  else Object.defineProperty(parent, last, { value, enumerable: true, writable: true });
  return copy;
}

/**
 * A valid body with one thing broken: a value replaced by a bad one, a control character slipped
 * into one of its strings, a field removed or an unknown one added (or, now and then, unchanged).
 */
function mutated(valid: unknown): fc.Arbitrary<string> {
  const paths = pathsIn(valid);
  const at = (path: JsonPath) =>
    path.reduce<unknown>((v, key) => (v as Record<string | number, unknown>)[key], valid);
  const strings = paths.filter((path) => typeof at(path) === 'string');
  const edits: fc.Arbitrary<unknown>[] = [
    fc.tuple(fc.constantFrom(...paths), badValue).map(([path, v]) => replaced(valid, path, v)),
    fc
      .constantFrom(...paths.filter((p) => p.length > 0))
      .map((path) => replaced(valid, path, undefined)),
    fc
      .constantFrom(...paths.filter((p) => typeof at(p) === 'object' && at(p) !== null))
      .chain((path) =>
        fc
          .tuple(fc.constantFrom('unknownField', '__proto__', 'constructor'), badValue)
          .map(([key, v]) => replaced(valid, [...path, key], v)),
      ),
    fc.constant(valid),
  ];
  if (strings.length > 0) {
    edits.push(
      fc.tuple(fc.constantFrom(...strings), controlChar, fc.nat()).map(([path, c, n]) => {
        const text = at(path) as string;
        const i = n % (text.length + 1);
        return replaced(valid, path, text.slice(0, i) + c + text.slice(i));
      }),
    );
  }
  return fc.oneof(...edits).map((body) => spliceRaw(JSON.stringify(body) ?? 'null'));
}

function body(valid: unknown): fc.Arbitrary<{ body: string; contentType: string }> {
  const json = fc.oneof(
    { weight: 5, arbitrary: mutated(valid) },
    { weight: 2, arbitrary: fc.constantFrom(...MALFORMED_JSON) },
    { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }).map((v) => JSON.stringify(v)) },
    { weight: 1, arbitrary: badValue.map((v) => spliceRaw(JSON.stringify(v) ?? 'null')) },
  );
  return fc
    .tuple(
      json,
      fc.constantFrom(
        'application/json',
        'application/json',
        'application/json',
        'text/plain',
        'application/x-www-form-urlencoded',
      ),
    )
    .map(([body, contentType]) => ({ body, contentType }));
}

/** `key=value` pairs from the route's own query keys and strangers, repeated keys included. */
function query(keys: readonly string[]): fc.Arbitrary<string> {
  const value = fc.oneof(
    badText,
    fc.constantFrom('1e308', '-0', 'NaN', '-1', '0', '501', 'weighing-a', 'bench-1'),
  );
  const escaped = (s: string) => {
    try {
      return encodeURIComponent(s);
    } catch {
      return '%ED%A0%80';
    }
  };
  const pair = fc
    .tuple(fc.constantFrom(...keys, 'unknown', `${keys[0] ?? 'x'}[a]`), value)
    .map(([k, v]) => `${escaped(k)}=${escaped(v)}`);
  return fc.oneof(
    fc.array(pair, { minLength: 1, maxLength: 3 }).map((pairs) => `?${pairs.join('&')}`),
    fc.constantFrom('?benchId=%00', '?materialId=%00', '?limit=1e308', '?%=%', '?a=%zz'),
  );
}

// ---- what each route is fuzzed with ----------------------------------------------------------

interface Fixtures {
  materialId: string;
  lotId: string;
  personId: string;
  batchId: string;
}

/** Valid bodies and query keys by route; a route not listed gets generic bodies. */
function validBodies(f: Fixtures): Record<string, unknown> {
  return {
    'POST /api/auth/badge': { benchId: 'bench-1', badge: DEMO.joss.badge },
    'POST /api/auth/login': { email: DEMO.lead.email, password: 'not-the-password' },
    'POST /api/people': { name: 'Fuzz Person', role: 'operator', pin: '2580' },
    'PATCH /api/people/:id': { name: 'Fuzz Target' },
    'PUT /api/people/:id/badge': { badge: 'FZ-0001' },
    'PUT /api/people/:id/pin': { pin: '2580' },
    'PUT /api/people/:id/password': { password: 'fuzz-password-1' },
    'POST /api/plan': {
      cavity: { shape: 'box', length: 10, width: 8, height: 3, unit: 'in' },
      overagePct: 10,
      cupLossG: 15,
      material: { ratio: { basis: 'weight', parts: [100, 14] }, specificGravity: 1.2 },
      scale: { readabilityG: 0.1, repeatabilityG: 0.05, capacityG: 4000 },
    },
    // Only ever aimed at a bench that does not exist (below): the fuzz pours nothing.
    'POST /api/benches/:id/simulator': [{ do: 'place-cup', massG: 40 }],
    'POST /api/benches/:id/checks': { kind: 'routine', referenceG: 200 },
    'PATCH /api/benches/:id': { checkEveryHours: 8, calibrationDueOn: '2027-03-01' },
    'POST /api/materials': {
      name: 'Fuzz resin',
      ratio: { basis: 'weight', parts: [100, 14] },
      specificGravity: 1.2,
      cautions: ['Wear gloves'],
      sdsRef: 'SDS-1',
    },
    'PATCH /api/materials/:id': { storageNote: 'Keep dry', costPerKg: [10, 12], lowStockG: null },
    'POST /api/materials/import': {
      csv: 'name,ratio_basis,ratio_a,ratio_b,specific_gravity\r\nFuzz import,weight,100,14,1.2\r\n',
    },
    'POST /api/lots': { materialId: f.materialId, part: 0, code: 'FZ-LOT-1', receivedG: 1000 },
    'POST /api/lots/:id/adjustments': { deltaG: 1.5, reason: 'Count' },
    'POST /api/batches': {
      benchId: 'bench-1',
      materialId: f.materialId,
      totalMassG: 100,
      lots: [{ part: 0, code: 'FZ-LOT-1' }],
    },
    'POST /api/batches/:id/abandon': { reason: 'fuzz probe' },
    'POST /api/batches/:id/dispositions': {
      decision: 'hold',
      reason: 'fuzz probe',
      password: 'not-the-password',
    },
  };
}

const QUERY_KEYS: Record<string, readonly string[]> = {
  'GET /api/lots': ['materialId'],
  'GET /api/materials': ['includeRetired'],
  'GET /api/batches': [
    'benchId',
    'state',
    'limit',
    'from',
    'to',
    'materialId',
    'operatorId',
    'verdict',
    'disposition',
    'lot',
    'sort',
    'cursor',
  ],
  'GET /api/batches/export.csv': ['from', 'to', 'lot', 'sort', 'verdict', 'disposition'],
  'GET /api/audit': ['entity', 'entityId', 'cursor', 'limit'],
  'GET /api/accuracy': ['groupBy', 'bucket', 'from', 'to'],
  'GET /api/batches/current': ['benchId'],
};

function realIdFor(pattern: string, f: Fixtures): string {
  if (pattern.startsWith('/api/people/')) return f.personId;
  if (pattern.startsWith('/api/materials/')) return f.materialId;
  if (pattern.startsWith('/api/lots/')) return f.lotId;
  if (pattern.startsWith('/api/batches/')) return f.batchId;
  // A bench id that names nothing, so a valid script cannot drive a real bench's simulator.
  if (pattern.startsWith('/api/benches/')) return 'bench-fuzz';
  return 'x';
}

/**
 * The cases that must never slip through, on every route and every time: each string of the
 * valid body with a NUL (PostgreSQL refuses NUL in text) or an escape in it, each path parameter
 * and query key as `%00`, `..` and a 5000-character id. As admin, whom every route lets in.
 */
function targetedProbes(route: string, f: Fixtures): Probe[] {
  const [method, pattern] = route.split(' ') as [string, string];
  const realId = realIdFor(pattern, f);
  const valid = validBodies(f)[route];
  const validJson = valid === undefined ? undefined : JSON.stringify(valid);
  const withBody = (path: string, body = validJson): Probe => ({
    role: 'admin',
    path,
    ...(method === 'GET' ? {} : { body: body ?? '{}', contentType: 'application/json' }),
  });
  const paths = pattern.includes(':')
    ? ['%00', `${realId}%00`, '..', 'x'.repeat(5_000)].map((id) => pattern.replace(/:\w+/, id))
    : [];
  const queries = (QUERY_KEYS[route] ?? []).map((key) => `${pattern}?${key}=%00`);
  const at = (path: JsonPath) =>
    path.reduce<unknown>((v, key) => (v as Record<string | number, unknown>)[key], valid);
  const tainted = pathsIn(valid)
    .filter((path) => typeof at(path) === 'string')
    .flatMap((path) =>
      ['\u0000', '\u001b'].map((c) =>
        spliceRaw(JSON.stringify(replaced(valid, path, `${at(path) as string}${c}`))),
      ),
    );
  const realPath = pattern.replace(/:\w+/, realId);
  return [
    ...paths.map((path) => withBody(path)),
    ...queries.map((path) => withBody(path)),
    ...tainted.map((body) => withBody(realPath, body)),
  ];
}

/** Generated probes, the same ones for a given seed. */
function randomProbes(route: string, f: Fixtures, seed: number): Probe[] {
  const [method, pattern] = route.split(' ') as [string, string];
  const segments = pattern
    .split('/')
    .map((part) => (part.startsWith(':') ? badSegment(realIdFor(pattern, f)) : fc.constant(part)));
  const path = fc.tuple(...segments).map((parts) => parts.join('/'));
  const keys = QUERY_KEYS[route];
  const withQuery = keys
    ? fc.tuple(path, query(keys)).map(([p, q]) => p + q)
    : fc.oneof(
        { weight: 4, arbitrary: path },
        { weight: 1, arbitrary: path.map((p) => `${p}?x=%00`) },
      );
  const role = fc.constantFrom<Role>('admin', 'operator');
  const probe =
    method === 'GET'
      ? fc.record({ role, path: withQuery })
      : fc
          .record({ role, path: withQuery, sent: body(validBodies(f)[route] ?? { note: 'x' }) })
          .map(({ sent, ...rest }) => ({ ...rest, ...sent }));
  return fc.sample(probe, { seed, numRuns: RANDOM_PROBES_PER_ROUTE });
}

function probes(route: string, f: Fixtures): Probe[] {
  return [...targetedProbes(route, f), ...randomProbes(route, f, seedOf(route))];
}

/** A seed per route from its name, so adding a route does not change the others' inputs. */
function seedOf(route: string): number {
  let hash = SEED;
  for (const ch of route) hash = (Math.imul(hash, 31) + ch.charCodeAt(0)) | 0;
  return hash;
}

const shown = (text: string | undefined, max = 200) =>
  text === undefined
    ? '(none)'
    : JSON.stringify(text.length > max ? `${text.slice(0, max)}… (${text.length} chars)` : text);

// ---- the test --------------------------------------------------------------------------------

describe('route fuzz: no input makes the hub answer 5xx', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let fixtures: Fixtures;
  let tokenFor: (role: Role) => Promise<string>;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '100000' });
    const people = await hub.app.get(PeopleRepository).list();
    const admin = people.find((p) => p.role === 'admin')!;
    // Joss signs in at bench 1 without a PIN; the operator's probes act as Joss there.
    const operator = people.find((p) => p.name === 'Joss Whitcombe')!;
    const tokens = hub.app.get(TokenService);
    // A fresh token per request, so a probe of sign-out cannot sign out the next probe.
    tokenFor = async (role) =>
      (
        await tokens.issue(
          role === 'admin' ? admin : operator,
          role === 'admin' ? undefined : 'bench-1',
        )
      ).token;
    const adminToken = await tokenFor('admin');
    const target = await call<Person>(hub, 'POST', '/api/people', {
      token: adminToken,
      body: { name: 'Fuzz Target', role: 'operator' },
    });
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token: adminToken });
    const material = materials.body.find((m) => m.active)!;
    // An open batch on bench 2 gives the batch routes a real id to act on.
    const batch = await call<Batch>(hub, 'POST', '/api/batches', {
      token: adminToken,
      body: { benchId: 'bench-2', materialId: material.id, totalMassG: 100 },
    });
    expect(batch.status).toBe(201);
    const lots = await call<Lot[]>(hub, 'GET', `/api/lots?materialId=${material.id}`, {
      token: adminToken,
    });
    fixtures = {
      materialId: material.id,
      lotId: lots.body[0]!.id,
      personId: target.body.id,
      batchId: String(batch.body.id),
    };
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  /** A batch a probe happened to start is abandoned at once, so the bench stays free. */
  async function neutralise(route: string, status: number, text: string): Promise<void> {
    if (route !== 'POST /api/batches' || status >= 300) return;
    const { id } = JSON.parse(text) as { id: number };
    const answer = await call(hub, 'POST', `/api/batches/${id}/abandon`, {
      token: await tokenFor('admin'),
      body: { reason: 'started by a fuzz probe' },
    });
    expect(answer.status).toBeLessThan(300);
  }

  // About 1,300 requests: some 20 s alone, longer beside the rest of the suite on two cores.
  it(
    'answers every generated request to every registered route without a 5xx',
    { timeout: 120_000 },
    async () => {
      const routes = registeredApiRoutes(hub);
      expect(routes).toContain('POST /api/batches');
      const failures: string[] = [];
      const reached = new Map<string, number>();
      for (const route of routes) {
        const [method] = route.split(' ') as [string];
        for (const probe of probes(route, fixtures)) {
          const answer = await rawRequest(hub.url, {
            method,
            path: probe.path,
            headers: {
              Authorization: `Bearer ${await tokenFor(probe.role)}`,
              ...(probe.contentType ? { 'Content-Type': probe.contentType } : {}),
            },
            ...(probe.body !== undefined ? { body: probe.body } : {}),
          });
          if (answer.status >= 500 || answer.status === 0) {
            failures.push(
              `${route} as ${probe.role}: ${method} ${shown(probe.path)} body ${shown(probe.body)}` +
                ` (${probe.contentType ?? 'no body'}) → ${answer.status} ${shown(answer.text)}`,
            );
          }
          if (![401, 403, 429].includes(answer.status)) {
            reached.set(route, (reached.get(route) ?? 0) + 1);
          }
          await neutralise(route, answer.status, answer.text);
        }
      }
      expect(failures).toEqual([]);
      // Not vacuous: every route was reached past sign-in and role checks by some probe.
      expect(routes.filter((route) => !reached.has(route))).toEqual([]);
      // Probes that happened to start a batch on bench 1 left it free again.
      const current = await call<{ batch: Batch | null }>(
        hub,
        'GET',
        '/api/batches/current?benchId=bench-1',
        { token: await tokenFor('admin') },
      );
      expect(current.body.batch).toBeNull();
    },
  );
});
