import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { CSV_COLUMNS, CsvImportResultSchema } from '#shared/schemas/performers.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { EMAILS, makePerformer, makeProduction, productionId, sessions, type Who } from '../fixtures/performers.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

let t: TestApp;
let as: Record<Who, string>;
let restore: () => Promise<void>;
let lantern: string;
let saltglass: string;

beforeAll(async () => {
  t = await createTestApp();
  as = await sessions(t);
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
  lantern = await productionId(t, 'The Lantern Keeper');
  saltglass = await productionId(t, 'Saltglass Mile');
});
afterAll(async () => {
  await t?.close();
});

const api = () => request(t.app);
const CONTACT = ['email', 'phone', 'emergency_contact_name', 'emergency_contact_phone', 'agent_name', 'agent_contact', 'notes'];
const performerCount = async () => Number((await t.db.db.selectFrom('performers').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);

async function exportCsv(who: Who, qs = '') {
  const res = await api().get(`/api/performers/export.csv${qs}`).set('Cookie', as[who]).buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks).toString('utf8')));
  });
  const text = res.body as string;
  const rows: string[][] = res.status === 200 ? parse(text, { bom: true }) : [];
  return { res, text, header: rows[0] ?? [], records: rows.slice(1).map((r) => Object.fromEntries((rows[0] ?? []).map((h, i) => [h, r[i]!]))) };
}

function importCsv(who: Who, csv: string | Buffer, opts: { productionId?: string; commit?: boolean; filename?: string } = {}) {
  const qs = `productionId=${opts.productionId ?? lantern}&commit=${opts.commit ? 'true' : 'false'}`;
  return api()
    .post(`/api/performers/import?${qs}`)
    .set('Cookie', as[who])
    .attach('file', typeof csv === 'string' ? Buffer.from(csv) : csv, { filename: opts.filename ?? 'performers.csv', contentType: 'text/csv' });
}

describe('GET /api/performers/export.csv', () => {
  it('exports the production with exactly the CSV columns and productions last', async () => {
    const { res, header, records } = await exportCsv('head', `?productionId=${lantern}`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe('attachment; filename="performers.csv"');
    expect(header).toEqual([...CSV_COLUMNS, 'productions']);
    expect(records.map((r) => r.legal_name)).toEqual(['Beatrix Nwachukwu', 'Corentin Malik Ashdown', 'Halvard Imre Solberg', 'Juno Castellane', 'Oswin Parfitt-Reyes', 'Tamsin Achebe-Lowry']);
    expect(records[4]).toMatchObject({ preferred_name: 'Oz Parfitt', email: 'oz.parfitt@example.test', character_name: 'The Drowned Sailor', productions: 'The Lantern Keeper', phone: '' });
  });

  it('exports as filtered: search and consent filter', async () => {
    const { records } = await exportCsv('lead', '?q=Castelane');
    expect(records.map((r) => r.legal_name)).toEqual(['Juno Castellane']);
    const p = await makeProduction(t, 'Export Filter Test', [{ email: EMAILS.head, role: 'head' }]);
    await makePerformer(t, 'Only One Here', [{ productionId: p }]);
    const withdrawn = await exportCsv('head', `?productionId=${p}&consent=withdrawn`);
    expect(withdrawn.records).toEqual([]);
    expect(withdrawn.header).toEqual([...CSV_COLUMNS, 'productions']);
    const incomplete = await exportCsv('head', `?productionId=${p}&consent=incomplete`);
    expect(incomplete.records.map((r) => r.legal_name)).toEqual(['Only One Here']);
  });

  it('leaves the contact columns out for those who do not manage every production exported', async () => {
    const artist = await exportCsv('artist', `?productionId=${lantern}`);
    expect(artist.res.status).toBe(200);
    expect(artist.header).toEqual([...CSV_COLUMNS.filter((c) => !CONTACT.includes(c)), 'productions']);
    expect(artist.text).not.toContain('@example.test');
    expect(artist.records).toHaveLength(6);
    // The Saltglass head is only an artist on Lantern.
    const artist2 = await exportCsv('artist2', `?productionId=${lantern}`);
    expect(artist2.text).not.toContain('oz.parfitt@example.test');
    // Unfiltered, the Lantern head's export also covers Saltglass, where she is an artist: no contacts.
    await makePerformer(t, 'Saltglass Person', [{ productionId: saltglass }], { email: 'salt@example.test' });
    const head = await exportCsv('head');
    expect(head.header).not.toContain('email');
    expect(head.records.map((r) => r.legal_name)).toContain('Saltglass Person');
    // The lead works on Lantern only and manages it: contacts included.
    const lead = await exportCsv('lead');
    expect(lead.header).toEqual([...CSV_COLUMNS, 'productions']);
    expect(lead.records.find((r) => r.legal_name === 'Juno Castellane')!.email).toBe('performer@plinth.test');
  });

  it('defuses spreadsheet formulas', async () => {
    await makePerformer(t, '=HYPERLINK("http://evil.test","click")', [{ productionId: lantern, characterName: '+SUM(A1:A9)' }], { preferredName: '@cmd', email: 'formula@example.test' });
    await t.db.db.updateTable('performers').set({ phone: '-2+3', notes: '\tTabbed', pronouns: 'she/her' }).where('email', '=', 'formula@example.test').execute();
    const { records } = await exportCsv('head', `?productionId=${lantern}&q=HYPERLINK`);
    expect(records).toHaveLength(1);
    expect(records[0]).toMatchObject({
      legal_name: `'=HYPERLINK("http://evil.test","click")`,
      preferred_name: "'@cmd",
      character_name: "'+SUM(A1:A9)",
      phone: "'-2+3",
      notes: "'\tTabbed",
      pronouns: 'she/her',
      email: 'formula@example.test',
    });
  });

  it('is refused to performers, the administrator and people without a role, and to staff of other productions', async () => {
    for (const who of ['performer', 'admin', 'norole'] as const) expect((await exportCsv(who)).res.status, who).toBe(403);
    const other = await makeProduction(t, 'Closed Set', []);
    expect((await exportCsv('head', `?productionId=${other}`)).res.status).toBe(403);
  });
});

describe('POST /api/performers/import', () => {
  const CLEAN = ['legal_name,preferred_name,email,character_name,phone', 'Ottilie Brandt,Otti,ottilie@example.test,Night Watch,+44 1632 960001', 'Rufus Adeyemi-Kane,,rufus@example.test,Harbour Ghost,', 'Signe Vass,,,Drowned Bride,'].join('\n');

  it('previews a clean file without writing, then commits it in one go', async () => {
    const before = await performerCount();
    const preview = await importCsv('head', CLEAN);
    expect(preview.status).toBe(200);
    const p = CsvImportResultSchema.parse(preview.body);
    expect(p).toMatchObject({ committed: false, errorCount: 0, fileErrors: [], created: 3, engaged: 0 });
    expect(p.rows.map((r) => [r.line, r.legalName, r.email, r.action, r.errors])).toEqual([
      [2, 'Ottilie Brandt', 'ottilie@example.test', 'create', {}],
      [3, 'Rufus Adeyemi-Kane', 'rufus@example.test', 'create', {}],
      [4, 'Signe Vass', null, 'create', {}],
    ]);
    expect(await performerCount()).toBe(before);

    const commit = await importCsv('head', CLEAN, { commit: true });
    expect(commit.status).toBe(200);
    expect(CsvImportResultSchema.parse(commit.body)).toMatchObject({ committed: true, created: 3, engaged: 0, errorCount: 0 });
    expect(await performerCount()).toBe(before + 3);
    const ottilie = await t.db.db
      .selectFrom('performers')
      .innerJoin('engagements', 'engagements.performer_id', 'performers.id')
      .select(['preferred_name', 'phone', 'engagements.production_id', 'engagements.character_name'])
      .where('email', '=', 'ottilie@example.test')
      .executeTakeFirstOrThrow();
    expect(ottilie).toEqual({ preferred_name: 'Otti', phone: '+44 1632 960001', production_id: lantern, character_name: 'Night Watch' });
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'performer.import').execute();
    expect(audit.map((a) => a.details)).toEqual([{ created: 3, engaged: 0, alreadyEngaged: 0 }]);
    // The same file again: every row is now already on the production.
    const again = CsvImportResultSchema.parse((await importCsv('head', CLEAN)).body);
    expect(again.rows.map((r) => r.action)).toEqual(['already_engaged', 'already_engaged', 'create']);
  });

  it('names every bad row by line and column, and a commit imports nothing', async () => {
    const csv = [
      'legal_name,email,character_name,pronouns',
      'Good One,good.one@example.test,Fisher,',
      ',nameless@example.test,Nobody,',
      'Bad Mail,not-an-email,Clerk,',
      '"Multi',
      'Line Name",multi@example.test,Two Lines,',
      `Long Part,long@example.test,${'x'.repeat(161)},${'p'.repeat(41)}`,
      'Good Two,good.two@example.test,Baker,',
    ].join('\r\n');
    const before = await performerCount();
    const preview = CsvImportResultSchema.parse((await importCsv('head', csv)).body);
    expect(preview.committed).toBe(false);
    expect(preview.errorCount).toBe(3);
    expect(preview.rows.map((r) => [r.line, Object.keys(r.errors).sort()])).toEqual([
      [2, []],
      [3, ['legal_name']],
      [4, ['email']],
      [5, []],
      [7, ['character_name', 'pronouns']],
      [8, []],
    ]);
    expect(preview.rows[1]!.errors.legal_name).toEqual(['Enter the legal name']);
    expect(preview.rows[2]!.errors.email).toEqual(['Enter a valid email address']);
    expect(preview.rows[3]!.legalName).toBe('Multi\r\nLine Name');

    const commit = await importCsv('head', csv, { commit: true });
    expect(commit.status).toBe(400);
    const body = ErrorBodySchema.parse(commit.body);
    expect(body.error.code).toBe('validation_failed');
    expect(body.error.details!.fields!.file).toEqual([
      'Line 3, legal_name: Enter the legal name',
      'Line 4, email: Enter a valid email address',
      'Line 7, pronouns: At most 40 characters',
      'Line 7, character_name: At most 160 characters',
    ]);
    expect(CsvImportResultSchema.parse(body.error.details!.result).rows).toHaveLength(6);
    expect(await performerCount()).toBe(before);
  });

  it('reports unknown, repeated and missing columns, naming them', async () => {
    const unknown = CsvImportResultSchema.parse((await importCsv('head', 'legal_name,favourite_colour,Shoe Size\nAnn,blue,5\n')).body);
    expect(unknown.rows).toEqual([]);
    expect(unknown.fileErrors).toHaveLength(1);
    expect(unknown.fileErrors[0]).toMatch(/^Unknown columns: "favourite_colour", "Shoe Size"\./);
    expect(unknown.errorCount).toBe(1);
    const twice = CsvImportResultSchema.parse((await importCsv('head', 'legal_name,Email,email\nAnn,a@x.test,b@x.test\n')).body);
    expect(twice.fileErrors).toEqual(['Column listed twice: email.']);
    const missing = CsvImportResultSchema.parse((await importCsv('head', 'preferred_name,email\nAnn,a@x.test\n')).body);
    expect(missing.fileErrors).toEqual(['The header row needs a legal_name column.']);
    // Header names are matched without regard to case or spaces.
    const loose = CsvImportResultSchema.parse((await importCsv('head', '\ufeffLegal Name,EMAIL\nAnn Loose,ann@example.test\n')).body);
    expect(loose).toMatchObject({ fileErrors: [], created: 1 });
  });

  it('flags a repeated e-mail on the later line, and engages a performer already on file instead of duplicating them', async () => {
    // A production of the importer's own elsewhere: a performer they already manage there may be engaged here too.
    const other = await makeProduction(t, 'Marta Elsewhere', [{ email: 'head@plinth.test', role: 'head' }]);
    await makePerformer(t, 'Saltglass Regular', [{ productionId: other }], { email: 'regular@example.test' });
    const csv = [
      'legal_name,email,character_name',
      'First Copy,twin@example.test,A',
      'Saltglass Regular,Regular@Example.test,Lantern Cameo',
      'Second Copy,TWIN@example.test,B',
      'Oz Again,oz.parfitt@example.test,',
    ].join('\n');
    const preview = CsvImportResultSchema.parse((await importCsv('head', csv)).body);
    expect(preview.rows.map((r) => [r.line, r.action, r.errors])).toEqual([
      [2, 'create', {}],
      [3, 'engage_existing', {}],
      [4, 'create', { email: ['The same e-mail is already on line 2 of this file.'] }],
      [5, 'already_engaged', {}],
    ]);
    expect(preview).toMatchObject({ errorCount: 1, created: 1, engaged: 1 });

    const fixed = csv.replace('Second Copy,TWIN@example.test,B\n', '');
    const before = await performerCount();
    const commit = await importCsv('head', fixed, { commit: true });
    expect(commit.status).toBe(200);
    expect(commit.body).toMatchObject({ committed: true, created: 1, engaged: 1 });
    expect(await performerCount()).toBe(before + 1);
    const regular = await t.db.db
      .selectFrom('engagements')
      .innerJoin('performers', 'performers.id', 'engagements.performer_id')
      .select(['engagements.production_id', 'engagements.character_name'])
      .where('performers.email', '=', 'regular@example.test')
      .orderBy('engagements.character_name')
      .execute();
    expect(regular).toEqual([
      { production_id: lantern, character_name: 'Lantern Cameo' },
      { production_id: other, character_name: null },
    ]);
  });

  it('turns away files that are not CSV text, with file errors in the preview and a 400 on commit', async () => {
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c489', 'hex');
    const preview = await importCsv('head', png, { filename: 'photo.csv' });
    expect(preview.status).toBe(200);
    expect(CsvImportResultSchema.parse(preview.body)).toMatchObject({ committed: false, rows: [], errorCount: 1 });
    expect(preview.body.fileErrors[0]).toMatch(/not a CSV file/);
    const latin1 = Buffer.from('legal_name\nJos\xe9 Mar\xeda\n', 'latin1');
    expect(CsvImportResultSchema.parse((await importCsv('head', latin1)).body).fileErrors[0]).toMatch(/not UTF-8/);
    const ragged = CsvImportResultSchema.parse((await importCsv('head', 'legal_name,email\r\nAnn,a@x.test\r\n\r\nBen,b@x.test,extra\r\n')).body);
    expect(ragged.fileErrors).toEqual(['Line 4: has 3 values but the header has 2 columns.']);
    const quote = CsvImportResultSchema.parse((await importCsv('head', 'legal_name,email\nAnn,a@x.test\n"Ben,b@x.test\n')).body);
    expect(quote.fileErrors).toEqual(['Line 3: a quoted value is never closed.']);
    expect(CsvImportResultSchema.parse((await importCsv('head', '')).body).fileErrors[0]).toMatch(/empty/);
    expect(CsvImportResultSchema.parse((await importCsv('head', 'legal_name\n')).body).fileErrors).toEqual(['The file has a header row but no performers.']);

    const before = await performerCount();
    const commit = await importCsv('head', png, { commit: true });
    expect(commit.status).toBe(400);
    expect(commit.body.error.details.fields.file[0]).toMatch(/not a CSV file/);
    expect(await performerCount()).toBe(before);
  });

  it('caps an import at 2,000 rows and 2 MB', async () => {
    const rows = Array.from({ length: 2001 }, (_, i) => `Person ${i}`);
    const many = CsvImportResultSchema.parse((await importCsv('head', ['legal_name', ...rows].join('\n'))).body);
    expect(many.fileErrors).toEqual(['At most 2,000 rows in one import; this file has 2,001.']);
    const huge = await importCsv('head', `legal_name,notes\n${`A,${'n'.repeat(1000)}\n`.repeat(2200)}`);
    expect(huge.status).toBe(413);
    expect(huge.body.error.code).toBe('payload_too_large');
    const missing = await api().post(`/api/performers/import?productionId=${lantern}`).set('Cookie', as.head).field('x', '1');
    expect(missing.status).toBe(400);
    expect(missing.body.error.details.fields.file).toEqual(['Choose a CSV file to import.']);
  });

  it('imports 2,000 rows in one commit', async () => {
    const before = await performerCount();
    const rows = Array.from({ length: 2000 }, (_, i) => `Bulk Person ${i},bulk${i}@example.test`);
    const res = await importCsv('head', ['legal_name,email', ...rows].join('\n'), { commit: true });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ committed: true, created: 2000 });
    expect(await performerCount()).toBe(before + 2000);
  });

  it('is atomic: a failure at the database on a later statement leaves nothing behind', async () => {
    // Simulates a collision the checks cannot see coming (another writer, a constraint): the
    // performers are inserted, then the second row's engagement is refused by the database.
    await t.db.pool.query(`
      create function fixture_collide() returns trigger language plpgsql as $$
      begin
        if new.character_name = 'Collides Here' then
          raise exception 'fixture collision' using errcode = 'unique_violation';
        end if;
        return new;
      end $$;
      create trigger fixture_collide before insert on engagements for each row execute function fixture_collide();
    `);
    try {
      const before = await performerCount();
      const csv = 'legal_name,email,character_name\nRow One,row.one@example.test,Fine\nRow Two,row.two@example.test,Collides Here\nRow Three,,Fine\n';
      expect(CsvImportResultSchema.parse((await importCsv('head', csv)).body).errorCount).toBe(0);
      const res = await importCsv('head', csv, { commit: true });
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields.file).toEqual(['Another change to the registry collided with this import. Nothing was imported; check the file again.']);
      expect(await performerCount()).toBe(before);
      expect(await t.db.db.selectFrom('performers').select('id').where('email', '=', 'row.one@example.test').executeTakeFirst()).toBeUndefined();
      expect(await t.db.db.selectFrom('audit_log').select('id').where('action', 'in', ['performer.import', 'performer.create']).execute()).toEqual([]);
    } finally {
      await t.db.pool.query('drop trigger fixture_collide on engagements; drop function fixture_collide()');
    }
  });

  it('re-imports its own export: the productions column is ignored and everyone is already engaged', async () => {
    const { res, text } = await exportCsv('head', `?productionId=${lantern}`);
    expect(res.status).toBe(200);
    const before = await performerCount();
    const preview = await importCsv('head', text);
    expect(preview.status).toBe(200);
    const result = CsvImportResultSchema.parse(preview.body);
    expect(result.fileErrors).toEqual([]);
    expect(result.errorCount).toBe(0);
    expect(result.rows.map((r) => r.action)).toEqual(Array(6).fill('already_engaged'));
    expect(await performerCount()).toBe(before);
  });

  it('needs performers.manage on the production imported into', async () => {
    for (const who of ['artist', 'archivist', 'artist2', 'performer', 'admin', 'norole'] as const) {
      const res = await importCsv(who, CLEAN, { commit: true });
      expect(res.status, who).toBe(403);
    }
    const before = await performerCount();
    expect((await importCsv('artist2', CLEAN, { productionId: saltglass, commit: true })).status).toBe(200);
    expect(await performerCount()).toBe(before + 3);
  });
});
