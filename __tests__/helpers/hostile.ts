import fc from 'fast-check';

// Hostile request parts for property tests: JSON written by hand (so a body can carry `__proto__` as an own key,
// numbers JSON.stringify cannot write, like 1e309, and raw text that is no JSON at all), query strings with
// repeated and oddly named keys, and the values an attacker or a broken client sends: wrong types, huge strings
// and arrays, impossible dates, control and bidi characters, SQL- and HTML-looking text, prototype keys.

/** JSON text taken as it is (a number token, an invalid token, a deep nest). */
export class Raw {
  constructor(readonly text: string) {}
}
/** An object as ordered entries, so any key (`__proto__` too) is an ordinary own key of the JSON text. */
export class Obj {
  constructor(readonly entries: ReadonlyArray<readonly [string, Json]>) {}
}
export type Json = null | boolean | number | string | Raw | Obj | Json[];

export function tree(value: unknown): Json {
  if (value === null || typeof value === 'boolean' || typeof value === 'string') return value;
  if (typeof value === 'number') return value;
  if (Array.isArray(value)) return value.map(tree);
  if (typeof value === 'object') return new Obj(Object.entries(value as Record<string, unknown>).map(([k, v]) => [k, tree(v)] as const));
  throw new Error(`tree: ${typeof value}`);
}

export function serialise(j: Json): string {
  if (j instanceof Raw) return j.text;
  if (j instanceof Obj) return `{${j.entries.map(([k, v]) => `${JSON.stringify(k)}:${serialise(v)}`).join(',')}}`;
  if (Array.isArray(j)) return `[${j.map(serialise).join(',')}]`;
  if (typeof j === 'number') {
    // The values JSON.stringify would turn into null go as the tokens a hand-made client would send.
    if (Number.isNaN(j)) return 'NaN';
    if (j === Infinity) return '1e309';
    if (j === -Infinity) return '-1e309';
    if (Object.is(j, -0)) return '-0';
  }
  return JSON.stringify(j);
}

type Path = Array<string | number>;

/** Every path to a value in the tree (object keys and array indices), the root excluded. */
export function paths(j: Json, at: Path = []): Path[] {
  const out: Path[] = [];
  if (j instanceof Obj) for (const [k, v] of j.entries) out.push([...at, k], ...paths(v, [...at, k]));
  else if (Array.isArray(j)) j.forEach((v, i) => out.push([...at, i], ...paths(v, [...at, i])));
  return out;
}

/** Paths to the objects in the tree, the root included (where an extra key can go). */
export function objectPaths(j: Json, at: Path = []): Path[] {
  const out: Path[] = j instanceof Obj ? [at] : [];
  if (j instanceof Obj) for (const [k, v] of j.entries) out.push(...objectPaths(v, [...at, k]));
  else if (Array.isArray(j)) j.forEach((v, i) => out.push(...objectPaths(v, [...at, i])));
  return out;
}

function update(j: Json, path: Path, f: (v: Json | undefined, parent: Json) => Json | undefined): Json {
  if (path.length === 0) return f(j, j) as Json;
  const [head, ...rest] = path;
  if (j instanceof Obj) {
    const entries: Array<readonly [string, Json]> = [];
    let found = false;
    for (const [k, v] of j.entries) {
      if (k !== head) entries.push([k, v]);
      else {
        found = true;
        const next = rest.length === 0 ? f(v, j) : update(v, rest, f);
        if (next !== undefined) entries.push([k, next]);
      }
    }
    if (!found && rest.length === 0) {
      const next = f(undefined, j);
      if (next !== undefined) entries.push([String(head), next]);
    }
    return new Obj(entries);
  }
  if (Array.isArray(j) && typeof head === 'number') {
    const copy = [...j];
    const next = rest.length === 0 ? f(copy[head], j) : update(copy[head], rest, f);
    if (next === undefined) copy.splice(head, 1);
    else copy[head] = next;
    return copy;
  }
  return j;
}

export type Mutation = { op: 'set'; path: Path; value: Json } | { op: 'delete'; path: Path } | { op: 'add'; at: Path; key: string; value: Json };

export function mutate(j: Json, m: Mutation): Json {
  if (m.op === 'set') return update(j, m.path, () => m.value);
  if (m.op === 'delete') return update(j, m.path, () => undefined);
  return update(j, m.at, (obj) => (obj instanceof Obj ? new Obj([...obj.entries, [m.key, m.value]]) : obj) as Json);
}

// ——— the values ———

export const HUGE = 'x'.repeat(100_000);
const nest = (depth: number, open: string, close: string) => new Raw(open.repeat(depth) + close.repeat(depth));

export const SQL_LIKE = ["' OR '1'='1", "'; DROP TABLE blocks; --", "Robert'); DROP TABLE bids;--", '1 UNION SELECT password_hash FROM accounts', '" OR ""="', '%', '_', '\\', "0x27' --"];
export const HTML_LIKE = ['<script>alert(1)</script>', '<img src=x onerror=alert(1)>', '"><svg onload=alert(1)>', '{{constructor.constructor("alert(1)")()}}', '${7*7}', '<!--', '&lt;b&gt;'];
export const BAD_DATES = ['2027-02-30', '2027-13-01', '2027-00-10', '2027-02-29', '', 'yesterday', 'today', '2027-1-5', '27-01-05', '2027/01/05', '0000-00-00', '9999-12-31', '1899-12-31', '2027-01-15T07:30:00', '2027-01-15T25:61:00-08:00', '2027-01-15T07:30:00+25:00', '+275760-09-13T00:00:00Z', ' 2027-01-15', '2027-01-15\n'];
export const ODD_TEXT = ['\u0000', 'a\u0000b', 'line\r\nBcc: x@y.example', '\u2028', '\u202eevil', '\ufeff', '\ud83d\ude00'.repeat(50), 'e\u0301', ' padded ', '\t', 'ＡＢＣ１２３', 'null', 'undefined', 'NaN', 'true', '[object Object]'];
export const PROTO_KEYS = ['__proto__', 'constructor', 'prototype', 'toString', 'valueOf', 'hasOwnProperty', 'isPrototypeOf', 'propertyIsEnumerable', 'toLocaleString', '__defineGetter__', '__lookupGetter__', '__defineSetter__'];

const pollution = (): Json[] => [
  new Obj([['__proto__', new Obj([['polluted', 'yes']])]]),
  new Obj([['constructor', new Obj([['prototype', new Obj([['polluted', 'yes']])]])]]),
  new Obj([['prototype', new Obj([['polluted', 'yes']])]]),
  new Obj([['toString', 'not a function']]),
];

/** A value that has no business where it goes (or, sometimes, a valid one: properties must hold either way). */
export function hostileValue(): fc.Arbitrary<Json> {
  return fc.oneof(
    { arbitrary: fc.constantFrom<Json>(null, true, false, 0, -1, 1.5, [], new Obj([]), '', '12', '0.18', HUGE, ...SQL_LIKE, ...HTML_LIKE, ...BAD_DATES, ...ODD_TEXT), weight: 6 },
    { arbitrary: fc.constantFrom<Json>(NaN, Infinity, -Infinity, -0, 1e308, -1e308, 5e-324, 2 ** 53 + 1, -(2 ** 53) - 1, 0.1 + 0.2), weight: 2 },
    { arbitrary: fc.constantFrom<Json>(new Raw('123456789012345678901234567890'), new Raw('1e999999'), new Raw('NaN'), new Raw('undefined'), new Raw('0x10'), new Raw('01'), new Raw('.5')), weight: 1 },
    { arbitrary: fc.double(), weight: 2 },
    { arbitrary: fc.integer({ min: -(2 ** 31), max: 2 ** 31 }), weight: 1 },
    { arbitrary: fc.string({ unit: 'binary', maxLength: 40 }), weight: 2 },
    { arbitrary: fc.array(fc.oneof(fc.integer(), fc.string({ maxLength: 5 })), { maxLength: 6 }) as fc.Arbitrary<Json>, weight: 1 },
    { arbitrary: fc.constantFrom<Json>(new Raw(`[${'1,'.repeat(30_000)}1]`), nest(2_000, '[', ']'), new Raw(`${'{"a":'.repeat(1_000)}1${'}'.repeat(1_000)}`), [HUGE, HUGE]), weight: 1 },
    { arbitrary: fc.constantFrom<Json>(...pollution()), weight: 2 },
  );
}

export function hostileKey(): fc.Arbitrary<string> {
  return fc.oneof({ arbitrary: fc.constantFrom(...PROTO_KEYS, '', ' ', 'a.b', '[0]', '$where', '$gt', 'id', 'ownerId', 'status', 'roles', 'admin'), weight: 3 }, { arbitrary: fc.string({ unit: 'binary', maxLength: 12 }), weight: 1 });
}

/** One to three changes to `base`, or a whole body that is not an object at all. */
export function hostileBody(base: Record<string, unknown>): fc.Arbitrary<Json> {
  const root = tree(base);
  const valuePaths = paths(root);
  const whole = fc.constantFrom<Json>(new Raw('[]'), new Raw('null'), new Raw('"text"'), new Raw('42'), new Raw('{"a":'), new Raw(''), new Raw('[{}]'), new Raw('{}'), ...pollution());
  // An empty base (a route that takes no fields): hostile keys and values are all there is to send.
  if (valuePaths.length === 0) return fc.oneof(whole, fc.tuple(hostileKey(), hostileValue()).map(([k, v]) => new Obj([[k, v]]) as Json));
  const mutation: fc.Arbitrary<Mutation> = fc.oneof(
    { arbitrary: fc.record({ op: fc.constant('set' as const), path: fc.constantFrom(...valuePaths), value: hostileValue() }), weight: 5 },
    { arbitrary: fc.record({ op: fc.constant('delete' as const), path: fc.constantFrom(...valuePaths) }), weight: 2 },
    { arbitrary: fc.record({ op: fc.constant('add' as const), at: fc.constantFrom(...objectPaths(root)), key: hostileKey(), value: hostileValue() }), weight: 3 },
  );
  const changed = fc.array(mutation, { minLength: 1, maxLength: 3 }).map((ms) => ms.reduce(mutate, root));
  return fc.oneof({ arbitrary: changed, weight: 6 }, { arbitrary: whole, weight: 1 });
}

// ——— query strings ———

export type QueryPairs = Array<[string, string]>;

export function hostileQueryValue(): fc.Arbitrary<string> {
  return fc.oneof(
    fc.constantFrom('', ' ', '-0', '-1', '0', '1e309', 'NaN', 'Infinity', '0x10', '1_000', ' 1', '１', '1.5', '99999999999999999999', 'x'.repeat(6_000), ...SQL_LIKE, ...HTML_LIKE, ...BAD_DATES, ...ODD_TEXT.filter((s) => !/[\ud800-\udfff]/.test(s) || s.length % 2 === 0)),
    fc.string({ unit: 'binary', maxLength: 30 }),
  );
}

/** One to three changes to a query: a key set to a hostile value, given twice, dropped, or a hostile key added. */
export function hostileQuery(base: Record<string, string>): fc.Arbitrary<QueryPairs> {
  const keys = Object.keys(base);
  const key = keys.length ? fc.oneof(fc.constantFrom(...keys), hostileKey()) : hostileKey();
  type Q = { op: 'set' | 'repeat' | 'drop' | 'bracket'; key: string; value: string };
  const change: fc.Arbitrary<Q> = fc.record({ op: fc.constantFrom<Q['op']>('set', 'set', 'repeat', 'drop', 'bracket'), key, value: hostileQueryValue() });
  return fc.array(change, { minLength: 1, maxLength: 3 }).map((cs) => {
    let pairs: QueryPairs = Object.entries(base);
    for (const c of cs) {
      if (c.op === 'set') pairs = [...pairs.filter(([k]) => k !== c.key), [c.key, c.value]];
      if (c.op === 'repeat') pairs = [...pairs, [c.key, c.value], [c.key, c.value]];
      if (c.op === 'drop') pairs = pairs.filter(([k]) => k !== c.key);
      if (c.op === 'bracket') pairs = [...pairs, [`${c.key}[]`, c.value], [`${c.key}[a]`, c.value]];
    }
    return pairs;
  });
}

export function queryString(pairs: QueryPairs): string {
  const enc = (s: string) => {
    try {
      return encodeURIComponent(s);
    } catch {
      // A lone surrogate cannot be percent-encoded as UTF-8; send its UTF-16 units the old way.
      return escape(s);
    }
  };
  return pairs.length ? `?${pairs.map(([k, v]) => `${enc(k)}=${enc(v)}`).join('&')}` : '';
}

/** Hostile ids for path parameters (percent-encoded by the caller, except the raw ones). */
export function hostileId(): fc.Arbitrary<{ raw: boolean; id: string }> {
  return fc.oneof(
    fc.constantFrom(...SQL_LIKE, ...HTML_LIKE, ...PROTO_KEYS, '..', '../../etc/passwd', 'null', 'undefined', 'NaN', '-1', '0', '1e309', '😀', '\u0000', ' ', 'a'.repeat(4_000), '00000000-0000-0000-0000-000000000000').map((id) => ({ raw: false, id })),
    fc.constantFrom('%E0%A4%A', '%zz', '%00', '%2e%2e', '%C0%AF', '%ED%A0%80').map((id) => ({ raw: true, id })),
    fc.string({ unit: 'binary', minLength: 1, maxLength: 20 }).map((id) => ({ raw: false, id })),
  );
}
