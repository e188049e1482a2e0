// The seeded demo, spanning two productions, as the permission matrix and the request fuzzer see it:
// real ids of every kind of record, the actors of every role, and the policy's view of each actor.
import request from 'supertest';
import type { Actor, Resource } from '#shared/policy.ts';
import { loadActor } from '../../../api/http/actor.ts';
import type { TestApp } from '../app.ts';
import { buildChecksWorld } from './world-checks.ts';

export const WHO = ['admin', 'head', 'lead', 'artist', 'archivist', 'performer', 'norole', 'otherLead'] as const;
export type Who = (typeof WHO)[number];

export const EMAIL: Record<Who, string> = {
  admin: 'admin@plinth.test',
  head: 'head@plinth.test',
  lead: 'lead@plinth.test',
  artist: 'artist@plinth.test',
  archivist: 'archivist@plinth.test',
  performer: 'performer@plinth.test',
  norole: 'norole@plinth.test',
  // The designated lead of the second production, with no role on the first.
  otherLead: 'lead.saltglass@plinth.test',
};

export interface World {
  t: TestApp;
  /** Real ids by name (see buildWorld). */
  id: Record<string, string>;
  actors: Record<Who, Actor>;
  /** The productions a performer is engaged on, for policy questions about their records. */
  engaged: Record<string, string[]>;
  /** Every cast's production and performer. */
  casts: Record<string, { productionId: string; performerId: string }>;
  /** A performer's record as the policy sees it: theirs, on every production they are engaged on. */
  performer(performerId: string): Resource;
  /** One cell needs its own session: sessions are changed by some routes (sign-out, tablet hand-over). */
  cookie(who: Who): Promise<string>;
  version(table: string, id: string): Promise<number>;
}

async function one(t: TestApp, text: string, values: unknown[] = []): Promise<string> {
  const { rows } = await t.db.pool.query<{ id: string }>(text, values);
  if (!rows[0]) throw new Error(`no row for ${text}`);
  return rows[0].id;
}

/** Adds the second production's lead and reads every id the route entries fill in. */
export async function buildWorld(t: TestApp): Promise<World> {
  const pool = t.db.pool;
  await pool.query(`insert into users (email, display_name) values ($1, 'No Role Yet'), ($2, 'Ilse Marrow') on conflict do nothing`, [EMAIL.norole, EMAIL.otherLead]);
  const id: Record<string, string> = {};
  id.lantern = await one(t, `select id from productions where name = 'The Lantern Keeper'`);
  id.saltglass = await one(t, `select id from productions where name = 'Saltglass Mile'`);
  id.admin = await t.userId(EMAIL.admin);
  id.otherLeadUser = await t.userId(EMAIL.otherLead);
  id.artistUser = await t.userId(EMAIL.artist);
  id.noroleUser = await t.userId(EMAIL.norole);
  await pool.query(`insert into lead_appointments (production_id, user_id, appointed_by, starts_at) values ($1, $2, $3, now() - interval '1 day')`, [id.saltglass, id.otherLeadUser, id.admin]);
  id.juno = await one(t, `select id from performers where legal_name = 'Juno Castellane'`);
  id.oz = await one(t, `select id from performers where legal_name = 'Oswin Parfitt-Reyes'`);
  // An address not yet confirmed, whose confirmation request may be sent again.
  id.cory = await one(t, `update performers set email_confirmed_at = null where legal_name = 'Corentin Malik Ashdown' returning id`);
  id.junoMedicalConsent = await one(t, `select c.id from consents c join consent_answers a on a.consent_id = c.id where c.performer_id = $1 and a.medical group by c.id order by c.id limit 1`, [id.juno]);
  id.ozConsent = await one(t, `select id from consents where performer_id = $1 and withdrawn_at is null order by signed_at desc limit 1`, [id.oz]);
  id.template = await one(t, `select id from consent_templates where kind = 'application'`);
  // A session of her own (patch tests are sessions too, but they move and end from their own page).
  id.booking = await one(t, `select id from bookings where performer_id = $1 and purpose <> 'patch_test' and status = 'booked' order by starts_at limit 1`, [id.juno]);
  id.membership = await one(t, `select m.id from memberships m join users u on u.id = m.user_id where u.email = $1 and m.production_id = $2`, [EMAIL.artist, id.lantern]);
  id.product = await one(t, `select id from products where name = 'Harbour Bond silicone adhesive'`);
  id.formulation = await one(t, `select id from product_formulations where product_id = $1 order by version desc limit 1`, [id.product]);
  id.lot = await one(t, `select id from product_lots where product_id = $1 order by code limit 1`, [id.product]);
  // A formulation whose ingredients were never recorded (one is added when the demo has none).
  const blank = await pool.query<{ id: string; product_id: string }>(`select id, product_id from product_formulations where inci_label is null order by id limit 1`);
  if (blank.rows[0]) {
    id.blankFormulation = blank.rows[0].id;
    id.blankFormulationProduct = blank.rows[0].product_id;
  } else {
    id.blankFormulationProduct = id.product;
    id.blankFormulation = await one(t, `insert into product_formulations (product_id, version, inci_label) select $1, max(version) + 1, null from product_formulations where product_id = $1 returning id`, [id.product]);
  }
  id.sdsProduct = await one(t, `select id from products where name = 'Tidewater citrus remover'`);
  id.ingredient = await one(t, `select id from ingredients where inci = 'Colophonium'`);
  id.site = await one(t, `select id from archive_locations where parent_id is null order by code limit 1`);
  id.shelf = await one(t, `select id from archive_locations where level = 'shelf' order by code limit 1`);
  id.junoCast = await one(t, `select id from casts where performer_id = $1 and status = 'in_store' and production_id = $2 order by label_code limit 1`, [id.juno, id.lantern]);
  id.junoCastCode = await one(t, `select label_code as id from casts where id = $1`, [id.junoCast]);
  id.castPhoto = await one(t, `select id from cast_photos where cast_id in (select id from casts where performer_id = $1) order by id limit 1`, [id.juno]);
  id.castOfPhoto = await one(t, `select cast_id as id from cast_photos where id = $1`, [id.castPhoto]);
  id.build = await one(t, `select id from appliance_builds where performer_id = $1 order by made_on limit 1`, [id.juno]);
  id.mold = await one(t, `select mold_id as id from appliance_builds where id = $1`, [id.build]);
  id.piece = await one(t, `select id from appliance_pieces where build_id = $1 and status = 'on_hand' order by number limit 1`, [id.build]);

  const head = await t.sessionFor(EMAIL.head);
  // A safety data sheet, a build photo and a portrait, so their downloads have something to send.
  const { samplePdf } = await import('../../fixtures/pdfs.ts');
  const { cameraJpeg } = await import('../../fixtures/images.ts');
  const sds = await request(t.app).put(`/api/products/${id.sdsProduct}/safety-data-sheet`).set('Cookie', head).field('version', '1').attach('sds', await samplePdf(), 'sheet.pdf');
  if (sds.status !== 200) throw new Error(`safety data sheet: ${sds.status}`);
  const photo = await request(t.app).put(`/api/appliance-builds/${id.build}/photo`).set('Cookie', head).attach('photo', await cameraJpeg(), 'piece.jpg');
  if (photo.status !== 200) throw new Error(`build photo: ${photo.status}`);
  const portrait = await request(t.app).put(`/api/performers/${id.juno}/portrait`).set('Cookie', head).attach('portrait', await cameraJpeg(), 'face.jpg');
  if (portrait.status !== 200) throw new Error(`portrait: ${portrait.status}`);
  // An open tablet request and a link request (whose mail gives the outbox a message).
  const tablet = await request(t.app).post('/api/signing-requests').set('Cookie', head).send({ performerId: id.juno, templateId: id.template, productionId: id.lantern, mode: 'tablet' });
  if (tablet.status !== 201) throw new Error(`signing request: ${tablet.status} ${tablet.text}`);
  id.signingRequest = tablet.body.id;
  const link = await request(t.app).post('/api/signing-requests').set('Cookie', head).send({ performerId: id.oz, templateId: id.template, productionId: id.lantern, mode: 'link' });
  if (link.status !== 201) throw new Error(`link request: ${link.status} ${link.text}`);
  const { readdir } = await import('node:fs/promises');
  const mails = (await readdir(t.config.mailDir)).filter((f) => f.endsWith('.eml'));
  if (!mails[0]) throw new Error('no mail was caught');
  id.mailFile = mails[0];
  id.mailFailure = await one(
    t,
    `insert into mail_failures (message, recipients, subject, error) values ($1, 'oz.parfitt@example.test', 'Please sign', 'connection refused') returning id`,
    [JSON.stringify({ to: 'oz.parfitt@example.test', subject: 'Please sign', text: 'A form is waiting for you.' })],
  );

  // A bin that holds nothing, so that removing it is allowed.
  const bin = await request(t.app).post('/api/archive/locations').set('Cookie', await t.sessionFor(EMAIL.archivist)).send({ parentId: id.shelf, code: 'B99', name: 'Spare bin', level: 'bin' });
  if (bin.status !== 201) throw new Error(`bin: ${bin.status} ${bin.text}`);
  id.emptyBin = bin.body.id;

  await buildChecksWorld(t, id);
  // Patch tests at each stage: Juno's, under reading (applied yesterday, its 24-hour reading due) and
  // closed (with readings), one booked here for her, and Tamsin's occluded one whose patches are still on.
  id.ptApplied = await one(t, `select booking_id as id from patch_tests where performer_id = $1 and status = 'applied'`, [id.juno]);
  id.ptAppliedSite = await one(t, `select id from patch_test_products where test_id = $1 order by position limit 1`, [id.ptApplied]);
  id.ptClosed = await one(t, `select booking_id as id from patch_tests where performer_id = $1 and status = 'closed' order by applied_at limit 1`, [id.juno]);
  id.ptReading = await one(t, `select r.id from patch_test_readings r join patch_test_products p on p.id = r.test_product_id where p.test_id = $1 order by p.position, r.point_id limit 1`, [id.ptClosed]);
  id.ptCovered = await one(
    t,
    `update patch_tests set removed_at = null where performer_id = (select id from performers where legal_name = 'Tamsin Achebe-Lowry') and status = 'applied' returning booking_id as id`,
  );
  const testLot = await pool.query<{ id: string; product_id: string }>(`select id, product_id from product_lots where code = 'MS-2604'`);
  id.ptLot = testLot.rows[0]!.id;
  id.ptProduct = testLot.rows[0]!.product_id;
  const lead = await t.sessionFor(EMAIL.lead);
  const booked = await request(t.app)
    .post('/api/patch-tests')
    .set('Cookie', head)
    .send({ performerId: id.juno, productionId: id.lantern, protocolId: 'department-use', startsAt: new Date(Date.now() + 14 * 86_400_000).toISOString(), location: 'Make-up room 1', products: [{ productId: id.ptProduct, lotId: id.ptLot, site: 'Left inner forearm 4' }] });
  if (booked.status !== 201) throw new Error(`patch test: ${booked.status} ${booked.text}`);
  id.ptBooked = booked.body.id;
  const readingPhoto = await request(t.app).post(`/api/patch-tests/${id.ptClosed}/readings/${id.ptReading}/photos`).set('Cookie', lead).attach('photo', await cameraJpeg(), 'site.jpg');
  if (readingPhoto.status !== 201) throw new Error(`reading photo: ${readingPhoto.status} ${readingPhoto.text}`);
  id.ptPhoto = await one(t, `select id from patch_test_photos where reading_id = $1`, [id.ptReading]);
  // Forms to sign one after another on the tablet.
  const bundle = await request(t.app).post('/api/signing-bundles').set('Cookie', head).send({ performerId: id.oz, productionId: id.lantern, templateIds: [id.template], mode: 'tablet' });
  if (bundle.status !== 201) throw new Error(`signing bundle: ${bundle.status} ${bundle.text}`);
  id.bundle = bundle.body.id;

  const actors = {} as Record<Who, Actor>;
  for (const who of Object.keys(EMAIL) as Who[]) actors[who] = (await loadActor(t.db.db, await t.userId(EMAIL[who])))!.actor;
  const { rows } = await pool.query<{ performer_id: string; ids: string[] }>(`select performer_id, array_agg(production_id::text order by production_id) as ids from engagements group by performer_id`);
  const engaged = Object.fromEntries(rows.map((r) => [r.performer_id, r.ids]));
  const castRows = await pool.query<{ id: string; production_id: string; performer_id: string }>(`select id, production_id, performer_id from casts`);
  const casts = Object.fromEntries(castRows.rows.map((c) => [c.id, { productionId: c.production_id, performerId: c.performer_id }]));
  return {
    t,
    id,
    actors,
    engaged,
    casts,
    performer: (performerId) => ({ performerId, performerProductionIds: engaged[performerId] ?? [] }),
    cookie: (who) => t.sessionFor(EMAIL[who]),
    async version(table, rowId) {
      const r = await pool.query<{ version: number }>(`select version from ${table} where id = $1`, [rowId]);
      if (!r.rows[0]) throw new Error(`no ${table} ${rowId}`);
      return r.rows[0].version;
    },
  };
}
