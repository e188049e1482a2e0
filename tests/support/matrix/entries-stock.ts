// The catalogue, its ingredients and test protocols (studio-wide), the archive and appliance builds.
import { cameraJpeg } from '../../fixtures/images.ts';
import { samplePdf } from '../../fixtures/pdfs.ts';
import { type Entries, either, onProduction, policy, readAs, today } from './entry.ts';
import type { World } from './world.ts';

/** A cast is the business of its own production and of every production its performer is engaged on. */
const castOf = (castKey: string) => (w: World) => {
  const c = w.casts[w.id[castKey]!]!;
  return { productionId: c.productionId, performerProductionIds: w.engaged[c.performerId] ?? [] };
};
const castPerformer = (castKey: string) => (w: World) => w.performer(w.casts[w.id[castKey]!]!.performerId);
const buildOn = onProduction('lantern');

async function lot(w: World, code: string) {
  const { rows } = await w.t.db.pool.query<{ id: string; product_id: string }>(`select id, product_id from product_lots where code = $1`, [code]);
  return rows[0]!;
}

/** A build every rule accepts: 15 g of part A of a 1 : 1 silicone with softener, pigment, a thinned coating. */
async function buildFields(w: World) {
  const m = async (role: string, code: string) => {
    const l = await lot(w, code);
    return { role, productId: l.product_id, lotId: l.id };
  };
  return {
    madeOn: today(),
    madeBy: 'Rafe Lindqvist',
    materials: [
      await m('part_a', 'SP-2611'),
      await m('part_b', 'SP-2611'),
      await m('softener', 'ST-2605'),
      await m('pigment', 'KW-2604'),
      await m('cap_material', 'LC-2604'),
      await m('solvent', 'MA-2603'),
      await m('release_agent', 'WR-2602'),
    ],
    mix: {
      ratio: { partA: 1, partB: 1 },
      softener: { percent: 100, makerMaxPercent: 100 },
      pigment: { kind: 'drops', drops: 10, dropMassG: 0.03 },
      target: { kind: 'partA', partAG: 15 },
      scaleResolutionG: 0.1,
    },
    weighed: { partA: 15.1, softener: 30, pigment: 0.3, partB: 15 },
    coating: { capParts: 1, solventParts: 8, targetMl: 90 },
    piecesMade: 5,
    notes: null,
  };
}

export const stockEntries: Entries = {
  'GET /api/ingredients': {},
  'POST /api/ingredients/match': { ok: 200, input: () => ({ body: { label: 'Aqua, Colophonium, Parfum' } }) },
  'GET /api/ingredients/:id': { input: (w) => ({ params: { id: w.id.ingredient! } }) },
  'POST /api/ingredients': { input: () => ({ body: { inci: 'Hydroxyethyl Lanternate', synonyms: [], cas: null, group: 'other', trivial: false } }) },
  'PUT /api/ingredients/:id': {
    input: async (w) => {
      const r = await readAs(w, 'head', `/api/ingredients/${w.id.ingredient}`);
      const { inci, synonyms, cas, group, trivial } = r as Record<string, unknown>;
      return { params: { id: w.id.ingredient! }, body: { ingredient: { inci, synonyms: [...(synonyms as string[]), 'Harbour rosin'], cas, group, trivial }, version: r.version } };
    },
  },
  'GET /api/products': {},
  'GET /api/products/:id': { input: (w) => ({ params: { id: w.id.product! } }) },
  'POST /api/products': { input: () => ({ body: { name: 'Gullwing bald cap sealer', category: 'sealer', exposure: 'leave_on' } }) },
  'PUT /api/products/:id': {
    input: async (w) => {
      const { rows } = await w.t.db.pool.query(`select * from products where id = $1`, [w.id.product]);
      const p = rows[0];
      return { params: { id: w.id.product! }, body: { name: p.name, maker: 'Gullhaven Works', category: p.category, exposure: p.exposure, version: p.version } };
    },
  },
  'POST /api/products/:id/formulations': {
    input: async (w) => ({ params: { id: w.id.product! }, body: { inciLabel: 'Dimethicone, Colophonium', note: 'Label changed', version: await w.version('products', w.id.product!) } }),
  },
  'PUT /api/products/:id/formulations/:formulationId/ingredients': {
    input: async (w) => ({
      params: { id: w.id.blankFormulationProduct!, formulationId: w.id.blankFormulation! },
      body: { inciLabel: 'Aqua, Glycerin', version: await w.version('products', w.id.blankFormulationProduct!) },
    }),
  },
  'POST /api/products/:id/lots': { input: () => ({}), note: 'filled below' },
  'PUT /api/products/:id/lots/:lotId': {
    input: async (w) => {
      const { rows } = await w.t.db.pool.query(`select code, expires_on::text as expires_on, version from product_lots where id = $1`, [w.id.lot]);
      return { params: { id: w.id.product!, lotId: w.id.lot! }, body: { code: rows[0].code, expiresOn: '2030-01-31', version: rows[0].version } };
    },
  },
  'PUT /api/products/:id/lots/:lotId/retired': {
    input: async (w) => ({ params: { id: w.id.product!, lotId: w.id.lot! }, body: { retired: true, version: await w.version('product_lots', w.id.lot!) } }),
  },
  'PUT /api/products/:id/safety-data-sheet': {
    input: async (w) => ({
      params: { id: w.id.sdsProduct! },
      upload: { field: 'sds', filename: 'sheet.pdf', bytes: await samplePdf('Safety data sheet, revised'), fields: { version: String(await w.version('products', w.id.sdsProduct!)) } },
    }),
  },
  'GET /api/products/:id/safety-data-sheet': { input: (w) => ({ params: { id: w.id.sdsProduct! } }) },
  'GET /api/protocols': {},
  'GET /api/protocols/:id': { input: () => ({ params: { id: 'occluded-48h' } }) },
  'GET /api/protocols/:id/versions': { input: () => ({ params: { id: 'occluded-48h' } }) },
  'PUT /api/protocols/:id': {
    input: async (w) => {
      const p = await readAs(w, 'head', '/api/protocols/occluded-48h');
      const protocol = p.protocol as Record<string, unknown>;
      return { params: { id: 'occluded-48h' }, body: { protocol: { ...protocol, description: `${String(protocol.description)} Revised.` }, version: p.version } };
    },
  },

  'GET /api/archive/locations': {},
  'POST /api/archive/locations': { input: (w) => ({ body: { parentId: w.id.site, code: 'Z9', name: 'Overflow room', level: 'room' } }) },
  'GET /api/archive/locations/:id': { input: (w) => ({ params: { id: w.id.site! } }) },
  'PATCH /api/archive/locations/:id': {
    input: async (w) => {
      const { rows } = await w.t.db.pool.query(`select parent_id, code, name, environment, version from archive_locations where id = $1`, [w.id.site]);
      const l = rows[0];
      return { params: { id: w.id.site! }, body: { parentId: l.parent_id, code: l.code, name: `${l.name} (main)`, environment: l.environment, version: l.version } };
    },
  },
  'DELETE /api/archive/locations/:id': { input: async (w) => ({ params: { id: w.id.emptyBin! }, query: { version: await w.version('archive_locations', w.id.emptyBin!) } }) },
  'GET /api/archive/labels.pdf': { may: policy('casts.read', castOf('junoCast')), input: (w) => ({ query: { casts: w.id.junoCast!, locations: w.id.site! } }) },
  'GET /api/archive/labels/:code': { may: policy('casts.read', castOf('junoCast')), input: (w) => ({ params: { code: w.id.junoCastCode! } }) },
  'GET /api/archive/retention': {},
  'GET /api/casts': {},
  'POST /api/casts': {
    may: policy('casts.manage', onProduction('lantern')),
    input: (w) => ({
      body: { performerId: w.id.juno, productionId: w.id.lantern, region: 'hand', kind: 'mold', material: 'Alginate and plaster bandage', madeOn: today(), madeBy: 'Nell Achterberg', locationId: w.id.emptyBin },
    }),
  },
  'GET /api/casts/:id': { may: policy('casts.read', castOf('junoCast')), input: (w) => ({ params: { id: w.id.junoCast! } }) },
  'PATCH /api/casts/:id': {
    may: policy('casts.manage', castOf('junoCast')),
    input: async (w) => {
      const { rows } = await w.t.db.pool.query(`select region, kind, material, made_on::text as made_on, made_by, poured_from_id, notes, version from casts where id = $1`, [w.id.junoCast]);
      const c = rows[0];
      return { params: { id: w.id.junoCast! }, body: { region: c.region, kind: c.kind, material: c.material, madeOn: c.made_on, madeBy: c.made_by, pouredFromId: c.poured_from_id, notes: 'Seam cleaned.', version: c.version } };
    },
  },
  'POST /api/casts/:id/movements': {
    may: policy('casts.manage', castOf('junoCast')),
    input: async (w) => ({ params: { id: w.id.junoCast! }, body: {
        kind: 'check_out',
        version: await w.version('casts', w.id.junoCast!),
        movedBy: 'Nell Achterberg',
        authorisedBy: 'Marta Oyelaran',
        holder: 'Rafe Lindqvist',
        reason: 'Sculpting a new appliance',
        dueBackAt: new Date(Date.now() + 7 * 86_400_000).toISOString(),
      },
    }),
  },
  'POST /api/casts/:id/condition-checks': { may: policy('casts.manage', castOf('junoCast')), input: (w) => ({ params: { id: w.id.junoCast! }, body: { checkedOn: today(), checkedBy: 'Nell Achterberg', grade: 'good' } }) },
  'GET /api/casts/:id/people': { may: policy('casts.manage', castOf('junoCast')), input: (w) => ({ params: { id: w.id.junoCast! } }) },
  'POST /api/casts/:id/photos': {
    may: policy('casts.manage', castOf('junoCast')),
    input: async (w) => ({ params: { id: w.id.junoCast! }, upload: { field: 'photo', filename: 'cast.jpg', bytes: await cameraJpeg() } }),
  },
  'GET /api/casts/:id/photos/:photoId': { may: either(policy('performer.self', castPerformer('castOfPhoto')), policy('casts.read', castOf('castOfPhoto'))), input: (w) => ({ params: { id: w.id.castOfPhoto!, photoId: w.id.castPhoto! } }) },
  'GET /api/casts/:id/photos/:photoId/thumbnail': { may: either(policy('performer.self', castPerformer('castOfPhoto')), policy('casts.read', castOf('castOfPhoto'))), input: (w) => ({ params: { id: w.id.castOfPhoto!, photoId: w.id.castPhoto! } }) },
  'DELETE /api/casts/:id/photos/:photoId': { may: policy('casts.manage', castOf('castOfPhoto')), input: (w) => ({ params: { id: w.id.castOfPhoto!, photoId: w.id.castPhoto! } }) },

  'GET /api/appliance-builds': { may: policy('builds.read', buildOn), input: (w) => ({ query: { productionId: w.id.lantern! } }) },
  'POST /api/appliance-builds': {
    may: policy('builds.manage', buildOn),
    input: async (w) => ({ body: { productionId: w.id.lantern, moldId: w.id.mold, ...(await buildFields(w)) } }),
  },
  'GET /api/appliance-builds/:id': { may: policy('builds.read', buildOn), input: (w) => ({ params: { id: w.id.build! } }) },
  'PUT /api/appliance-builds/:id': {
    may: policy('builds.manage', buildOn),
    input: async (w) => ({ params: { id: w.id.build! }, body: { ...(await buildFields(w)), version: await w.version('appliance_builds', w.id.build!) } }),
  },
  'PUT /api/appliance-builds/:id/photo': {
    may: policy('builds.manage', buildOn),
    input: async (w) => ({ params: { id: w.id.build! }, upload: { field: 'photo', filename: 'piece.jpg', bytes: await cameraJpeg() } }),
  },
  'GET /api/appliance-builds/:id/photo': {
    may: either(policy('performer.self', (w) => w.performer(w.id.juno!)), policy('builds.read', buildOn)),
    input: (w) => ({ params: { id: w.id.build! } }),
    note: 'the performer sees the pieces made for their skin',
  },
  'PUT /api/appliance-pieces/:id/status': {
    may: policy('builds.manage', buildOn),
    input: async (w) => ({ params: { id: w.id.piece! }, body: { status: 'spoiled', note: 'Torn at the edge', version: await w.version('appliance_pieces', w.id.piece!) } }),
  },
  'GET /api/appliance-molds': { may: policy('builds.read', buildOn), input: (w) => ({ query: { productionId: w.id.lantern! } }) },
  'GET /api/appliance-outlooks': { may: policy('builds.read', buildOn), input: (w) => ({ query: { productionId: w.id.lantern! } }) },
  'PUT /api/appliance-plans': {
    may: policy('builds.plan', buildOn),
    input: async (w) => {
      const { rows } = await w.t.db.pool.query(`select version from appliance_plans where production_id = $1 and mold_id = $2`, [w.id.lantern, w.id.mold]);
      return { body: { productionId: w.id.lantern, moldId: w.id.mold, shootDaysPlanned: 12, spares: { kind: 'perDay', sparesPerDay: 1 }, piecesPerDay: 1, version: rows[0]?.version ?? null } };
    },
  },
};

stockEntries['POST /api/products/:id/lots'] = {
  input: (w) => ({ params: { id: w.id.product! }, body: { code: 'HB-3001', expiresOn: '2030-06-30' } }),
};
