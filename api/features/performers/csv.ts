import { CsvError, parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { z } from 'zod';
import { CSV_COLUMNS, type CsvColumn, EngagementInputSchema, PerformerFieldsSchema } from '#shared/schemas/performers.ts';
import type { ExportRow } from './list-repo.ts';
import type { PerformerFields } from './repo.ts';

import { IMPORT_MAX_BYTES, IMPORT_MAX_ROWS } from '#shared/limits.ts';

export { IMPORT_MAX_BYTES, IMPORT_MAX_ROWS };

/** Columns that hold contact details: exported only to those who may see them. */
export const CONTACT_COLUMNS: readonly CsvColumn[] = [
  'email',
  'phone',
  'emergency_contact_name',
  'emergency_contact_phone',
  'agent_name',
  'agent_contact',
  'notes',
];

const COLUMN_TO_FIELD: Record<Exclude<CsvColumn, 'character_name'>, keyof PerformerFields> = {
  legal_name: 'legalName',
  preferred_name: 'preferredName',
  pronouns: 'pronouns',
  email: 'email',
  phone: 'phone',
  emergency_contact_name: 'emergencyContactName',
  emergency_contact_phone: 'emergencyContactPhone',
  agent_name: 'agentName',
  agent_contact: 'agentContact',
  notes: 'notes',
};
const FIELD_TO_COLUMN = new Map(Object.entries(COLUMN_TO_FIELD).map(([column, field]) => [field as string, column]));

// ---- export

/**
 * A spreadsheet runs a cell that starts with = + - @ (or a tab or carriage return before one) as a
 * formula; a leading apostrophe makes it plain text again (OWASP "CSV injection").
 */
export function guardCell(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

export function exportColumns(includeContact: boolean): string[] {
  return [...CSV_COLUMNS.filter((c) => includeContact || !CONTACT_COLUMNS.includes(c)), 'productions'];
}

/**
 * The registry table as CSV: CSV_COLUMNS then `productions` (names joined with "; "). Without
 * contact access the contact columns are left out altogether, not sent empty. `character_name` is
 * the part on the filtered production, or every part shown when no production is filtered.
 */
export function performersCsv(
  rows: readonly ExportRow[],
  opts: { includeContact: boolean; productionId?: string; showsProduction: (productionId: string) => boolean },
): string {
  const columns = exportColumns(opts.includeContact);
  const records = rows.map((r) => {
    const engagements = r.engagements.filter((e) => opts.showsProduction(e.productionId));
    const characters = opts.productionId ? engagements.filter((e) => e.productionId === opts.productionId) : engagements;
    const full: Record<string, string | null> = {
      legal_name: r.legalName,
      preferred_name: r.preferredName,
      pronouns: r.pronouns,
      email: r.email,
      phone: r.phone,
      emergency_contact_name: r.emergencyContactName,
      emergency_contact_phone: r.emergencyContactPhone,
      agent_name: r.agentName,
      agent_contact: r.agentContact,
      character_name: characters.flatMap((e) => (e.characterName ? [e.characterName] : [])).join('; '),
      notes: r.notes,
      productions: engagements.map((e) => e.productionName).join('; '),
    };
    return columns.map((c) => guardCell(full[c] ?? ''));
  });
  // A BOM so spreadsheet programs read the file as UTF-8; the importer accepts it back.
  return stringify(records, { header: true, columns, bom: true, record_delimiter: 'windows' });
}

// ---- import: reading the file

export interface CsvLine {
  line: number;
  values: Partial<Record<CsvColumn, string>>;
}

export interface ParsedImport {
  fileErrors: string[];
  lines: CsvLine[];
}

class HeaderProblem extends Error {
  constructor(readonly problems: string[]) {
    super('header');
  }
}

/** Start offsets of each line, for turning a byte offset into a 1-based line number. */
function lineStarts(buf: Buffer): number[] {
  const starts = [0];
  for (let i = buf.indexOf(0x0a); i !== -1; i = buf.indexOf(0x0a, i + 1)) starts.push(i + 1);
  return starts;
}

function lineOf(starts: readonly number[], offset: number): number {
  let lo = 0;
  let hi = starts.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (starts[mid]! <= offset) lo = mid;
    else hi = mid - 1;
  }
  return lo + 1;
}

/** The offset where the next record really starts: after the blank lines the parser skips. */
function skipBlank(buf: Buffer, offset: number): number {
  let i = offset;
  while (i < buf.length && (buf[i] === 0x20 || buf[i] === 0x09 || buf[i] === 0x0d || buf[i] === 0x0a)) i++;
  return i;
}

/** Where the header record ends (the first line break outside quotes). */
function headerEnd(buf: Buffer, from: number): number {
  let quoted = false;
  for (let i = from; i < buf.length; i++) {
    if (buf[i] === 0x22) quoted = !quoted;
    else if (buf[i] === 0x0a && !quoted) return i + 1;
  }
  return buf.length;
}

const UTF8 = new TextDecoder('utf-8', { fatal: true });

function normaliseHeader(h: string): string {
  return h.trim().toLowerCase().replace(/[\s-]+/g, '_');
}

function csvErrorMessage(err: CsvError, line: number): string {
  const e = err as CsvError & { record?: unknown[]; columns?: unknown[] };
  switch (err.code) {
    case 'CSV_QUOTE_NOT_CLOSED':
      return `Line ${line}: a quoted value is never closed.`;
    case 'CSV_INVALID_CLOSING_QUOTE':
      return `Line ${line}: a quote inside a value must be doubled ("").`;
    case 'CSV_RECORD_INCONSISTENT_COLUMNS':
    case 'CSV_RECORD_INCONSISTENT_FIELDS_LENGTH':
      return Array.isArray(e.record) && Array.isArray(e.columns)
        ? `Line ${line}: has ${e.record.length} values but the header has ${e.columns.length} columns.`
        : `Line ${line}: has a different number of values from the header.`;
    default:
      return `Line ${line}: cannot be read as CSV (${err.code}).`;
  }
}

/**
 * Reads an uploaded CSV: UTF-8 text, a header naming only known columns (legal_name required),
 * at most IMPORT_MAX_ROWS rows. Parsed with csv-parse as `columns: true` would (a function here
 * only so the header is checked before any row), `bom`, `trim`, `skip_empty_lines`, and nothing
 * relaxed: a ragged row or a stray quote stops the file. Each row keeps the line it starts on.
 */
export function readImportFile(buf: Buffer): ParsedImport {
  if (buf.includes(0)) return { fileErrors: ['This is not a CSV file: it contains binary data. Export the sheet as "CSV UTF-8".'], lines: [] };
  try {
    UTF8.decode(buf);
  } catch {
    return { fileErrors: ['This file is not UTF-8 text. In your spreadsheet choose "Save as… CSV UTF-8" and try again.'], lines: [] };
  }
  const starts = lineStarts(buf);
  const bomLength = buf.subarray(0, 3).equals(Buffer.from([0xef, 0xbb, 0xbf])) ? 3 : 0;
  let nextStart = headerEnd(buf, skipBlank(buf, bomLength));
  const recordLines: number[] = [];
  // Filled in by the parser's callbacks.
  const seen: { header: string[] | null } = { header: null };
  let records: Record<string, string>[];
  try {
    records = parse(buf, {
      bom: true,
      trim: true,
      skip_empty_lines: true,
      columns: (raw: string[]) => {
        const header = raw.map(normaliseHeader);
        seen.header = header;
        const problems: string[] = [];
        // "productions" is what the export adds; it is read-only information, so an export re-imports cleanly.
        const unknown = raw.filter((_, i) => header[i] !== 'productions' && !(CSV_COLUMNS as readonly string[]).includes(header[i]!));
        if (unknown.length) problems.push(`Unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.map((u) => `"${u}"`).join(', ')}. Known columns: ${CSV_COLUMNS.join(', ')}.`);
        const dupes = [...new Set(header.filter((h, i) => header.indexOf(h) !== i))];
        if (dupes.length) problems.push(`Column${dupes.length > 1 ? 's' : ''} listed twice: ${dupes.join(', ')}.`);
        if (!header.includes('legal_name')) problems.push('The header row needs a legal_name column.');
        if (problems.length) throw new HeaderProblem(problems);
        return header;
      },
      on_record: (record: Record<string, string>, context: { bytes: number }) => {
        recordLines.push(lineOf(starts, skipBlank(buf, nextStart)));
        nextStart = context.bytes;
        return record;
      },
    });
  } catch (err) {
    if (err instanceof HeaderProblem) return { fileErrors: err.problems, lines: [] };
    if (err instanceof CsvError) return { fileErrors: [csvErrorMessage(err, lineOf(starts, skipBlank(buf, nextStart)))], lines: [] };
    throw err;
  }
  if (!seen.header) return { fileErrors: ['The file is empty: it needs a header row with at least legal_name.'], lines: [] };
  if (records.length === 0) return { fileErrors: ['The file has a header row but no performers.'], lines: [] };
  if (records.length > IMPORT_MAX_ROWS) {
    return { fileErrors: [`At most ${IMPORT_MAX_ROWS.toLocaleString('en-GB')} rows in one import; this file has ${records.length.toLocaleString('en-GB')}.`], lines: [] };
  }
  return { fileErrors: [], lines: records.map((values, i) => ({ line: recordLines[i]!, values })) };
}

// ---- import: checking the rows

export type ImportPlan =
  | { action: 'create'; line: number; fields: PerformerFields; characterName: string | null }
  | { action: 'engage_existing'; line: number; performerId: string; characterName: string | null }
  | { action: 'already_engaged'; line: number; performerId: string };

export interface RowResult {
  line: number;
  legalName: string;
  email: string | null;
  action: 'create' | 'engage_existing' | 'already_engaged';
  errors: Record<string, string[]>;
}

function columnErrors(issues: readonly z.core.$ZodIssue[], column: (path: string) => string): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of issues) {
    const key = column(String(issue.path[0] ?? ''));
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/**
 * Checks every row with the same rules as the form (PerformerFieldsSchema, and the engagement's
 * character name), errors keyed by column. An e-mail seen on an earlier line is an error on the
 * later one; an e-mail of a performer already on file engages them instead of creating a duplicate.
 */
export function checkImportRows(
  lines: readonly CsvLine[],
  productionId: string,
  existing: ReadonlyMap<string, { id: string; productionIds: readonly string[] }>,
  /** Whether the importer already manages a performer engaged on one of these productions. */
  manages: (productionIds: readonly string[]) => boolean = () => true,
  /** Addresses that are staff sign-ins: never a performer's contact address. */
  staffAddresses: ReadonlySet<string> = new Set(),
): { rows: RowResult[]; plans: ImportPlan[] } {
  const firstLineOfEmail = new Map<string, number>();
  const rows: RowResult[] = [];
  const plans: ImportPlan[] = [];
  for (const { line, values } of lines) {
    const input: Record<string, string> = {};
    for (const [column, field] of Object.entries(COLUMN_TO_FIELD)) {
      const v = values[column as CsvColumn];
      if (v !== undefined) input[field] = v;
    }
    const fields = PerformerFieldsSchema.safeParse(input);
    const character = EngagementInputSchema.safeParse({ productionId, characterName: values.character_name ?? null });
    const errors: Record<string, string[]> = {
      ...(fields.success ? {} : columnErrors(fields.error.issues, (f) => FIELD_TO_COLUMN.get(f) ?? f)),
      ...(character.success ? {} : columnErrors(character.error.issues, () => 'character_name')),
    };
    const parsedEmail = PerformerFieldsSchema.shape.email.safeParse(values.email ?? null);
    const email = parsedEmail.success ? parsedEmail.data : values.email?.trim() || null;
    if (parsedEmail.success && email) {
      const earlier = firstLineOfEmail.get(email);
      if (earlier !== undefined) (errors.email ??= []).push(`The same e-mail is already on line ${earlier} of this file.`);
      else firstLineOfEmail.set(email, line);
    }
    const match = email ? existing.get(email) : undefined;
    // An import never pulls in someone the importer does not already manage: merely seeing a
    // performer on another production must not turn into editing their record, seeing their
    // contact details or (to this production's lead) their health answers.
    if (match && !match.productionIds.includes(productionId) && !manages(match.productionIds)) {
      (errors.email ??= []).push('This e-mail belongs to a performer you do not manage. Leave this row out and ask the department head of their production or the studio administrator.');
    }
    if (email && staffAddresses.has(email)) (errors.email ??= []).push("This address belongs to a member of staff's sign-in, not a performer.");
    const action = match ? (match.productionIds.includes(productionId) ? 'already_engaged' : 'engage_existing') : 'create';
    rows.push({ line, legalName: values.legal_name ?? '', email, action, errors });
    if (Object.keys(errors).length > 0 || !fields.success || !character.success) continue;
    const characterName = character.data.characterName;
    if (match && action === 'already_engaged') plans.push({ action, line, performerId: match.id });
    else if (match) plans.push({ action: 'engage_existing', line, performerId: match.id, characterName });
    else plans.push({ action: 'create', line, fields: fields.data, characterName });
  }
  return { rows, plans };
}
