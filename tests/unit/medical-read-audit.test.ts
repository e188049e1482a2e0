import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// Every audit entry of a health-data read names what it exposed (`details.fields`), so the log
// answers "what did they see", not only "did they look". This reads the API's own source.
const API_DIR = path.resolve(import.meta.dirname, '../../api');

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(full);
    return e.name.endsWith('.ts') ? [full] : [];
  });
}

/** The object literal around `at`: from the nearest unmatched `{` before it to its matching `}`. */
function enclosingObject(source: string, at: number): string {
  let depth = 0;
  let start = at;
  for (; start >= 0; start--) {
    const c = source[start];
    if (c === '}') depth++;
    else if (c === '{') {
      if (depth === 0) break;
      depth--;
    }
  }
  depth = 0;
  let end = start;
  for (; end < source.length; end++) {
    const c = source[end];
    if (c === '{') depth++;
    else if (c === '}' && --depth === 0) break;
  }
  return source.slice(start, end + 1);
}

/** Each `medical.read` audit event written in this source, with whether its details name fields. */
export function medicalReadWrites(source: string): { line: number; namesFields: boolean }[] {
  const found: { line: number; namesFields: boolean }[] = [];
  for (const m of source.matchAll(/action:\s*'medical\.read'/g)) {
    const event = enclosingObject(source, m.index);
    found.push({ line: source.slice(0, m.index).split('\n').length, namesFields: /\bdetails:\s*\{[\s\S]*\bfields\b/.test(event) });
  }
  return found;
}

describe('health-data reads in the audit log', () => {
  it('the scan tells an entry that names its fields from one that does not (so the check can fail)', () => {
    const good = `await recordEvent(ctx.db, { actorUserId: a, action: 'medical.read', performerId, entityType: 'x', req, details: { performerId, fields: ['note'] } });`;
    const bad = `await recordEvent(ctx.db, {\n  actorUserId: a,\n  action: 'medical.read',\n  entityType: 'x',\n  details: { performerId: p },\n});`;
    const none = `await recordEvent(ctx.db, { actorUserId: a, action: 'medical.read', entityType: 'x', req });`;
    expect(medicalReadWrites(good)).toEqual([{ line: 1, namesFields: true }]);
    expect(medicalReadWrites(bad)).toEqual([{ line: 3, namesFields: false }]);
    expect(medicalReadWrites(none)).toEqual([{ line: 1, namesFields: false }]);
  });

  it('every medical.read entry the API writes names the fields it exposed in details.fields', () => {
    const writes = sourceFiles(API_DIR).flatMap((file) => medicalReadWrites(readFileSync(file, 'utf8')).map((w) => ({ ...w, at: `${path.relative(API_DIR, file)}:${w.line}` })));
    // The API reads health details in many places; finding few means the scan lost its way.
    expect(writes.length).toBeGreaterThanOrEqual(12);
    expect(writes.filter((w) => !w.namesFields).map((w) => w.at)).toEqual([]);
  });
});
