// Pieces of `npm run bench`: autocannon runs, the statements a request makes and their plans, and
// the size of the client's initial JavaScript.
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import autocannon from 'autocannon';
import type express from 'express';
import pg from 'pg';
import { WORD_SIMILARITY_INDEX_CUTOFF_TEXT } from '../api/db/index.ts';

export interface Row {
  label: string;
  connections: number;
  rps: number;
  p50: number;
  p975: number;
  p99: number;
  failed: number;
  /**
   * CPU a request cost, in ms: the API's (this process's main thread, where the app and its pg clients
   * run; autocannon has a thread of its own) and PostgreSQL's (every process of the cluster). Unlike
   * req/s it hardly moves when something else on the machine takes a core. Null without /proc.
   */
  cpu: { app: number; db: number } | null;
}

/** What a CPU sampler reads: clock ticks so far of this process's main thread and of the cluster. */
interface CpuTicks {
  app: number;
  db: number;
}

const TICKS_PER_SECOND = (() => {
  try {
    return Number(execFileSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).trim()) || 100;
  } catch {
    return 100;
  }
})();

/** utime + stime of one /proc stat file, and the parent's pid (the fields after the command's closing bracket). */
function statOf(file: string): { ticks: number; ppid: number } | null {
  try {
    const text = readFileSync(file, 'utf8');
    const fields = text.slice(text.lastIndexOf(')') + 2).split(' ');
    return { ticks: Number(fields[11]) + Number(fields[12]), ppid: Number(fields[1]) };
  } catch {
    return null;
  }
}

/**
 * Reads the CPU used so far by this process's main thread and by the PostgreSQL cluster whose server
 * process is `postmasterPid` (it and its children), or null where there is no /proc to read.
 */
export function cpuSampler(postmasterPid: number | null): (() => CpuTicks) | null {
  if (postmasterPid === null || statOf(`/proc/${process.pid}/task/${process.pid}/stat`) === null) return null;
  return () => {
    let db = 0;
    for (const entry of readdirSync('/proc')) {
      if (!/^\d+$/.test(entry)) continue;
      const st = statOf(`/proc/${entry}/stat`);
      if (st && (Number(entry) === postmasterPid || st.ppid === postmasterPid)) db += st.ticks;
    }
    return { app: statOf(`/proc/${process.pid}/task/${process.pid}/stat`)!.ticks, db };
  };
}

/** The server process of the cluster `connectionString` names, found from one of its backends; null when not on this machine. */
export async function postmasterPidOf(connectionString: string): Promise<number | null> {
  const client = new pg.Client({ connectionString });
  await client.connect();
  try {
    const { rows } = await client.query<{ pid: number }>('select pg_backend_pid() as pid');
    return statOf(`/proc/${rows[0]!.pid}/stat`)?.ppid ?? null;
  } finally {
    await client.end();
  }
}

export interface Target {
  label: string;
  url: string;
  cookie?: string;
  method?: 'GET' | 'POST';
  body?: unknown;
  origin?: string;
}

/** autocannon in a worker thread, so the load generator does not share the server's event loop. */
export async function measure(t: Target, connections: number, seconds: number, cpu: (() => CpuTicks) | null = null): Promise<Row> {
  const headers: Record<string, string> = {};
  if (t.cookie) headers.cookie = t.cookie;
  if (t.body !== undefined) headers['content-type'] = 'application/json';
  if (t.origin) headers.origin = t.origin;
  const opts = { url: t.url, connections, headers, workers: 1, method: t.method ?? 'GET', ...(t.body !== undefined ? { body: JSON.stringify(t.body) } : {}) };
  await autocannon({ ...opts, duration: 1 });
  const before = cpu?.();
  const r = await autocannon({ ...opts, duration: seconds });
  const after = cpu?.();
  const perRequest = (ticks: number) => (ticks * 1000) / TICKS_PER_SECOND / Math.max(1, r.requests.total);
  return {
    label: t.label,
    connections,
    rps: r.requests.average,
    p50: r.latency.p50,
    p975: r.latency.p97_5,
    p99: r.latency.p99,
    failed: r.non2xx + r.errors + r.timeouts,
    cpu: before && after ? { app: perRequest(after.app - before.app), db: perRequest(after.db - before.db) } : null,
  };
}

export function listen(app: express.Express): Promise<{ server: Server; base: string }> {
  return new Promise((resolve) => {
    const server = app.listen(0, '127.0.0.1', () => resolve({ server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }));
  });
}

export function formatTable(rows: Row[], baselineRps: (connections: number) => number): string {
  const head = ['route', 'conns', 'req/s', 'p50 ms', 'p97.5 ms', 'p99 ms', '× baseline', 'CPU ms/req app + db'];
  const body = rows.map((r) => [
    r.label + (r.failed ? `  (${r.failed} failed)` : ''),
    String(r.connections),
    r.rps.toFixed(0),
    r.p50.toFixed(1),
    r.p975.toFixed(1),
    r.p99.toFixed(1),
    (r.rps / baselineRps(r.connections)).toFixed(2),
    r.cpu ? `${r.cpu.app.toFixed(2)} + ${r.cpu.db.toFixed(2)}` : 'n/a',
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]) => `| ${cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join(' | ')} |`;
  return [line(head), `|${widths.map((w, i) => (i === 0 ? '-'.repeat(w + 2) : `${'-'.repeat(w + 1)}:`)).join('|')}|`, ...body.map(line)].join('\n');
}

export interface Statement {
  text: string;
  values: unknown[];
}

/**
 * Records every statement any pg client of this process sends while `on` (the app runs in this
 * process): Kysely's queries and the session store's named ones alike.
 */
export function statementRecorder(): { start(): void; stop(): Statement[] } {
  let recording: Statement[] | null = null;
  const proto = pg.Client.prototype as unknown as { query: (...args: unknown[]) => unknown };
  const original = proto.query;
  proto.query = function (this: unknown, ...args: unknown[]) {
    if (recording) {
      const [first, second] = args;
      if (typeof first === 'string') recording.push({ text: first, values: Array.isArray(second) ? second : [] });
      else if (first && typeof first === 'object' && 'text' in first) {
        const q = first as { text: string; values?: unknown[] };
        recording.push({ text: q.text, values: q.values ?? (Array.isArray(second) ? second : []) });
      }
    }
    return original.apply(this, args);
  };
  return {
    start() {
      recording = [];
    },
    stop() {
      const out = recording ?? [];
      recording = null;
      return out;
    },
  };
}

export interface PlanReport {
  route: string;
  sql: string;
  executionMs: number;
  /** Sequential scans in the plan, with the table's estimated rows. */
  seqScans: { table: string; rows: number }[];
  /** Sequential scans over a table of at least LARGE_TABLE_ROWS rows. */
  flagged: boolean;
  plan: unknown;
}

export const LARGE_TABLE_ROWS = Number(process.env.BENCH_LARGE_TABLE_ROWS ?? 10_000);

function seqScansOf(node: Record<string, unknown>, out: string[] = []): string[] {
  if (node['Node Type'] === 'Seq Scan' && typeof node['Relation Name'] === 'string') out.push(node['Relation Name']);
  for (const child of (node.Plans as Record<string, unknown>[] | undefined) ?? []) seqScansOf(child, out);
  return out;
}

/** EXPLAIN (ANALYZE, FORMAT JSON) of each read a route made, on a client of its own; writes are left alone. */
export async function explainStatements(connectionString: string, route: string, statements: Statement[]): Promise<PlanReport[]> {
  const client = new pg.Client({ connectionString, options: `-c pg_trgm.word_similarity_threshold=${WORD_SIMILARITY_INDEX_CUTOFF_TEXT} -c jit=off` });
  await client.connect();
  try {
    const sizes = new Map((await client.query<{ relname: string; n: number }>(`select relname, reltuples::float8 as n from pg_class where relkind = 'r'`)).rows.map((r) => [r.relname, r.n]));
    const seen = new Set<string>();
    const out: PlanReport[] = [];
    for (const s of statements) {
      const text = s.text.trim();
      if (!/^(select|with)\b/i.test(text) || /\b(insert|update|delete)\b/i.test(text) || /\bpg_(class|catalog|advisory)/i.test(text) || seen.has(text)) continue;
      seen.add(text);
      // Inside a transaction that is rolled back, so nothing a statement might do stays.
      await client.query('begin');
      try {
        const { rows } = await client.query<{ 'QUERY PLAN': [{ Plan: Record<string, unknown>; 'Execution Time': number }] }>(`explain (analyze, format json) ${text}`, s.values);
        const top = rows[0]!['QUERY PLAN'][0];
        const seqScans = seqScansOf(top.Plan).map((table) => ({ table, rows: Math.max(0, sizes.get(table) ?? 0) }));
        out.push({ route, sql: text.replace(/\s+/g, ' ').slice(0, 300), executionMs: top['Execution Time'], seqScans, flagged: seqScans.some((x) => x.rows >= LARGE_TABLE_ROWS), plan: top.Plan });
      } finally {
        await client.query('rollback');
      }
    }
    return out;
  } finally {
    await client.end();
  }
}

/** The gzip size of the JavaScript index.html loads before anything else (its entry and modulepreloads). */
export async function initialJsGzipBytes(distDir: string): Promise<{ files: { file: string; bytes: number; gzipBytes: number }[]; gzipBytes: number }> {
  const html = await readFile(path.join(distDir, 'index.html'), 'utf8');
  const srcs = [...html.matchAll(/<script[^>]+type="module"[^>]+src="([^"]+)"/g), ...html.matchAll(/<link[^>]+rel="modulepreload"[^>]+href="([^"]+)"/g)].map((m) => m[1]!);
  const files = await Promise.all(
    [...new Set(srcs)].map(async (src) => {
      const bytes = await readFile(path.join(distDir, src.replace(/^\//, '')));
      return { file: src, bytes: bytes.length, gzipBytes: gzipSync(bytes).length };
    }),
  );
  return { files, gzipBytes: files.reduce((a, f) => a + f.gzipBytes, 0) };
}
