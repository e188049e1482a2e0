import { afterEach, beforeEach } from 'vitest';

/**
 * A test that writes to console.error or console.warn fails, unless the line was expected: an
 * error nobody asserted on is a bug nobody saw. Output outside a test (imports, setup) is not judged.
 */
const KNOWN_NOISE = [
  // The bundled identity provider is a development fake; it says so on Node 20 and about its memory store.
  /^oidc-provider WARNING:/,
];

let watching = false;
let unexpected: string[] = [];
let expected: RegExp[] = [];

function guard(kind: 'error' | 'warn') {
  const original = console[kind].bind(console);
  console[kind] = (...args: unknown[]) => {
    const line = args.map((a) => (a instanceof Error ? a.message : String(a))).join(' ');
    if (watching && !KNOWN_NOISE.some((re) => re.test(line)) && !expected.some((re) => re.test(line))) unexpected.push(`console.${kind}: ${line}`);
    original(...args);
  };
}
guard('error');
guard('warn');

/** Declares console output the current test is meant to produce. */
export function expectConsole(pattern: RegExp): void {
  expected.push(pattern);
}

beforeEach(() => {
  watching = true;
  unexpected = [];
  expected = [];
});

afterEach(() => {
  watching = false;
  const lines = unexpected;
  unexpected = [];
  if (lines.length) throw new Error(`Unexpected console output during the test:\n${lines.join('\n')}`);
});
