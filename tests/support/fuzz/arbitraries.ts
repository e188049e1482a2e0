// Hostile inputs for every request schema, as fast-check arbitraries: wrong types, huge strings, deep
// nesting, prototype-pollution keys, awkward unicode, NaN-ish numbers, arrays for scalars, unknown fields.
import fc from 'fast-check';

const NASTY_STRINGS = [
  '',
  ' ',
  '\u0000',
  '\u0007bell',
  '\u202Eright-to-left',
  '\uFEFFbom',
  'zero\u200Bwidth',
  '\uD800',
  '𝔓𝔩𝔦𝔫𝔱𝔥 🧪💉',
  "'; drop table users; --",
  '<script>alert(1)</script>',
  '../../etc/passwd',
  '%00%2e%2e%2f',
  'NaN',
  'Infinity',
  '-0',
  '1e309',
  'true',
  'null',
  '__proto__',
  'constructor',
  '{"$ne":null}',
  '00000000-0000-0000-0000-000000000000',
  '9'.repeat(400),
];

export const hostileString = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.string({ unit: 'grapheme', maxLength: 20 }),
  fc.constantFrom(...NASTY_STRINGS),
  fc.integer({ min: 1_000, max: 300_000 }).map((n) => 'x'.repeat(n)),
);

export const hostileNumber = fc.oneof(
  fc.integer(),
  fc.double(),
  fc.constantFrom(-1, 0, -0, 0.5, 2 ** 31, 2 ** 53 + 2, 1e308, -1e308, Number.NaN, Number.POSITIVE_INFINITY),
);

/** A value nested this deep: objects in arrays in objects. */
export function nested(depth: number): unknown {
  let v: unknown = 'bottom';
  for (let i = 0; i < depth; i++) v = i % 2 ? [v] : { a: v };
  return v;
}

const pollution = fc.constantFrom<Record<string, unknown>>(
  JSON.parse('{"__proto__":{"isAdmin":true,"polluted":"yes"}}'),
  JSON.parse('{"constructor":{"prototype":{"polluted":"yes"}}}'),
  JSON.parse('{"prototype":{"polluted":"yes"},"toString":"x","hasOwnProperty":1}'),
);

export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  hostileString,
  hostileNumber,
  fc.boolean(),
  fc.constant(null),
  fc.array(hostileString, { maxLength: 6 }),
  fc.dictionary(hostileString, hostileString, { maxKeys: 4 }),
  fc.integer({ min: 20, max: 3_000 }).map(nested),
  pollution,
);

/** Every path to a leaf of a JSON value, so one field at a time can be spoiled. */
export function leafPaths(value: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  if (Array.isArray(value)) return value.length ? value.flatMap((v, i) => leafPaths(v, [...prefix, i])) : [prefix];
  if (value && typeof value === 'object') {
    const keys = Object.keys(value);
    return keys.length ? keys.flatMap((k) => leafPaths((value as Record<string, unknown>)[k], [...prefix, k])) : [prefix];
  }
  return [prefix];
}

function setAt(value: unknown, path: (string | number)[], leaf: unknown): unknown {
  if (path.length === 0) return leaf;
  const [head, ...rest] = path;
  const copy = (Array.isArray(value) ? [...value] : { ...(value as object) }) as Record<string | number, unknown>;
  Object.defineProperty(copy, head!, { value: setAt(copy[head!], rest, leaf), enumerable: true, writable: true, configurable: true });
  return copy;
}

function omit(value: unknown, key: string): unknown {
  const { [key]: _gone, ...rest } = value as Record<string, unknown>;
  return rest;
}

/** Spoils a valid object: one field replaced, a field left out, unknown or polluting fields added, or the whole of it replaced. */
export function spoiled(base: Record<string, unknown>): fc.Arbitrary<unknown> {
  const paths = leafPaths(base).filter((p) => p.length > 0);
  const keys = Object.keys(base);
  const options: fc.Arbitrary<unknown>[] = [
    fc.record({ extra: fc.dictionary(fc.oneof(hostileString, fc.constantFrom('__proto__', 'constructor', 'prototype', 'isAdmin', 'id', 'version')), hostileValue, { minKeys: 1, maxKeys: 3 }) }).map(({ extra }) => {
      const out: Record<string, unknown> = { ...base };
      for (const [k, v] of Object.entries(extra)) Object.defineProperty(out, k, { value: v, enumerable: true, writable: true, configurable: true });
      return out;
    }),
    pollution.map((p) => ({ ...base, ...p })),
    hostileValue,
  ];
  if (paths.length) options.unshift(fc.tuple(fc.constantFrom(...paths), hostileValue).map(([p, v]) => setAt(base, p, v)), fc.tuple(fc.constantFrom(...paths), fc.array(hostileValue, { maxLength: 3 })).map(([p, v]) => setAt(base, p, v)));
  if (keys.length) options.push(fc.constantFrom(...keys).map((k) => omit(base, k)));
  return fc.oneof(...options);
}

/** Raw JSON texts no object literal can make: numbers past a double, duplicate keys, deep arrays, broken text. */
export const rawJsonBodies = fc.oneof(
  fc.constantFrom(
    '{"version":1e999}',
    '{"version":-1e999,"id":"a"}',
    '{"a":1,"a":2,"__proto__":{"isAdmin":true}}',
    `${'['.repeat(5_000)}${']'.repeat(5_000)}`,
    '{"email":"\\ud800@example.test"}',
    '"just a string"',
    '12345',
    'null',
    '[]',
    '{',
    '{"a":"\u0000"}',
  ),
  fc.string({ unit: 'binary', maxLength: 60 }),
);

/** A query string as a client might send it: spoiled values, repeated keys (arrays), brackets, bad escapes. */
export function spoiledQuery(base: Record<string, string | number>): fc.Arbitrary<string> {
  const keys = [...Object.keys(base), 'page', 'pageSize', 'q', 'productionId', 'performerId', '__proto__', 'constructor'];
  const enc = (v: unknown) => encodeURIComponent(typeof v === 'string' ? v : JSON.stringify(v) ?? 'undefined');
  const baseText = Object.entries(base).map(([k, v]) => `${encodeURIComponent(k)}=${encodeURIComponent(String(v))}`);
  return fc.oneof(
    fc.tuple(fc.constantFrom(...keys), hostileValue).map(([k, v]) => [...baseText.filter((p) => !p.startsWith(`${k}=`)), `${k}=${enc(v)}`.slice(0, 6_000)].join('&')),
    fc.tuple(fc.constantFrom(...keys), fc.array(hostileString.map((s) => s.slice(0, 200)), { minLength: 2, maxLength: 4 })).map(([k, vs]) => [...baseText, ...vs.map((v) => `${k}=${enc(v)}`)].join('&')),
    fc.constantFrom('a[b]=1&a[c]=2', '__proto__[isAdmin]=true', 'constructor[prototype][x]=1', 'page=%E0%A4%A', 'page=1&page=2', '=&&=', 'pageSize=-1', 'page=1e400', 'q=%00').map((extra) => [...baseText, extra].join('&')),
  );
}
