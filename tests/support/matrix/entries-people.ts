// Performers, their identity, consents, signing requests and bookings.
import { cameraJpeg } from '../../fixtures/images.ts';
import { samplePdf } from '../../fixtures/pdfs.ts';
import { type Entries, both, either, onProduction, policy } from './entry.ts';
import type { World } from './world.ts';

const juno = (w: World) => w.performer(w.id.juno!);
const oz = (w: World) => w.performer(w.id.oz!);
const cory = (w: World) => w.performer(w.id.cory!);
/** A consent is the record of the production it was given to (both chosen consents were given to the first). */
const consentOf = (key: 'juno' | 'oz') => (w: World) => ({ performerId: w.id[key]!, performerProductionIds: (w.engaged[w.id[key]!] ?? []).filter((p) => p === w.id.lantern) });

const lanternQuery = (w: World) => ({ query: { productionId: w.id.lantern! } });

async function ozEdit(w: World) {
  const { rows } = await w.t.db.pool.query(`select * from performers where id = $1`, [w.id.oz]);
  const p = rows[0];
  return {
    params: { id: w.id.oz! },
    body: {
      legalName: p.legal_name,
      preferredName: p.preferred_name,
      pronouns: p.pronouns,
      email: p.email,
      phone: p.phone,
      emergencyContactName: p.emergency_contact_name,
      emergencyContactPhone: 'Production office, +44 20 7946 0001',
      agentName: p.agent_name,
      agentContact: p.agent_contact,
      notes: p.notes,
      engagements: [{ productionId: w.id.lantern, characterName: 'The Drowned Sailor', startsOn: '2026-09-14', endsOn: '2027-04-30' }],
      version: p.version,
    },
  };
}

export const peopleEntries: Entries = {
  'GET /api/performers': { may: policy('performers.view', onProduction('lantern')), input: lanternQuery },
  'GET /api/performers/export.csv': { may: policy('performers.view', onProduction('lantern')), input: lanternQuery },
  'POST /api/performers/import': {
    may: policy('performers.manage', onProduction('lantern')),
    ok: 200,
    input: (w) => ({
      query: { productionId: w.id.lantern!, commit: 'false' },
      upload: { field: 'file', filename: 'cast.csv', bytes: Buffer.from('legal_name,email,character_name\nMirela Stroud,mirela.stroud@example.test,The Ferrywoman\n') },
    }),
  },
  'GET /api/performers/:id': { may: policy('performer.view', juno), input: (w) => ({ params: { id: w.id.juno! } }) },
  'POST /api/performers': {
    may: policy('performers.manage', onProduction('lantern')),
    input: (w) => ({ body: { legalName: 'Mirela Stroud', engagements: [{ productionId: w.id.lantern, characterName: 'The Ferrywoman' }] } }),
  },
  'PATCH /api/performers/:id': { may: policy('performers.manage', oz), input: ozEdit },
  'PUT /api/performers/:id/account': {
    may: policy('accounts.unlink', juno),
    input: async (w) => ({ params: { id: w.id.juno! }, body: { userId: null, version: await w.version('performers', w.id.juno!) } }),
  },
  'PUT /api/performers/:id/portrait': {
    may: policy('performers.manage', juno),
    input: async (w) => ({ params: { id: w.id.juno! }, upload: { field: 'portrait', filename: 'face.jpg', bytes: await cameraJpeg() } }),
  },
  'DELETE /api/performers/:id/portrait': { may: policy('performers.manage', juno), input: (w) => ({ params: { id: w.id.juno! } }) },
  'GET /api/performers/:id/portrait': { may: policy('performer.view', juno), input: (w) => ({ params: { id: w.id.juno! } }) },
  'GET /api/performers/:id/portrait/thumbnail': { may: policy('performer.view', juno), input: (w) => ({ params: { id: w.id.juno! } }) },
  'POST /api/performers/:id/email-confirmation': { may: policy('accounts.invite', cory), input: (w) => ({ params: { id: w.id.cory! } }), note: 'an address not yet confirmed' },
  'POST /api/performers/:id/account-invitation': { may: policy('accounts.invite', oz), input: (w) => ({ params: { id: w.id.oz! } }) },
  'GET /api/performers/:id/records.zip': { may: policy('medical.read', juno), input: (w) => ({ params: { id: w.id.juno! } }) },
  'GET /api/performers/:id/health-reads': { may: policy('medical.read', juno), input: (w) => ({ params: { id: w.id.juno! } }) },

  'GET /api/consent-templates': { may: policy('templates.read') },
  'GET /api/consent-templates/:id': { may: policy('templates.read'), input: (w) => ({ params: { id: w.id.template! } }) },
  'GET /api/consent-templates/:id/versions': { may: policy('templates.read'), input: (w) => ({ params: { id: w.id.template! } }) },
  'POST /api/consent-templates': {
    input: () => ({ body: { kind: 'application', title: 'Wear and removal of a bald cap', body: 'I agree to wear a bald cap for the scenes named by the department.', questions: [], validityDays: 365 } }),
  },
  'PUT /api/consent-templates/:id': {
    input: async (w) => {
      const { rows } = await w.t.db.pool.query(`select v.title, v.body, v.questions, v.validity_days, v.version from consent_templates t join consent_template_versions v on v.template_id = t.id and v.version = t.current_version where t.id = $1`, [w.id.template]);
      const v = rows[0];
      return { params: { id: w.id.template! }, body: { kind: 'application', title: `${v.title} (revised)`, body: v.body, questions: v.questions, validityDays: v.validity_days, version: v.version } };
    },
  },
  'PUT /api/consent-templates/:id/archived': { input: (w) => ({ params: { id: w.id.template! }, body: { archived: true } }) },
  'GET /api/signing-requests': { may: policy('consents.request', onProduction('lantern')), input: lanternQuery },
  'POST /api/signing-requests': {
    may: policy('consents.request', onProduction('lantern')),
    input: (w) => ({ body: { performerId: w.id.juno, templateId: w.id.template, productionId: w.id.lantern, mode: 'tablet' } }),
  },
  'POST /api/signing-requests/:id/cancel': { may: policy('consents.request', onProduction('lantern')), input: (w) => ({ params: { id: w.id.signingRequest! } }) },
  'POST /api/signing-requests/:id/hand-over': { may: policy('consents.request', onProduction('lantern')), input: (w) => ({ params: { id: w.id.signingRequest! } }) },
  'GET /api/consents': { may: policy('consents.view', juno), input: (w) => ({ query: { performerId: w.id.juno! } }) },
  'GET /api/consents/:id': { may: policy('consents.view', consentOf('juno')), input: (w) => ({ params: { id: w.id.junoMedicalConsent! } }) },
  'GET /api/consents/:id/pdf': {
    may: both(policy('consents.view', consentOf('juno')), policy('medical.read', consentOf('juno'))),
    input: (w) => ({ params: { id: w.id.junoMedicalConsent! } }),
    note: 'the signed copy holds health answers, so it is guarded like them',
  },
  'POST /api/consents/:id/withdraw': {
    may: policy('consents.withdraw', consentOf('juno')),
    input: async (w) => ({ params: { id: w.id.junoMedicalConsent! }, body: { reason: 'Changed my mind', version: await w.version('consents', w.id.junoMedicalConsent!) } }),
  },
  'POST /api/consents/verify': { may: policy('consents.verify'), input: async () => ({ upload: { field: 'file', filename: 'copy.pdf', bytes: await samplePdf('Not a Plinth copy') } }) },
  'GET /api/bookings': { may: policy('sessions.view', onProduction('lantern')), input: lanternQuery },
  'POST /api/bookings': {
    may: policy('sessions.book', onProduction('lantern')),
    input: (w) => ({ body: { performerId: w.id.juno, productionId: w.id.lantern, purpose: 'application', startsAt: new Date(Date.now() + 3 * 86_400_000).toISOString(), location: 'Make-up room 1' } }),
  },
  'POST /api/bookings/:id/cancel': { may: policy('sessions.book', onProduction('lantern')), input: (w) => ({ params: { id: w.id.booking! } }) },
  // The performer's own casts and builds reach them through their record; staff read those they may.
  'GET /api/performers/:id/casts': { may: either(policy('performer.self', juno), policy('casts.read', juno)), input: (w) => ({ params: { id: w.id.juno! } }) },
  'GET /api/performers/:id/appliance-builds': { may: either(policy('performer.self', juno), policy('builds.read', juno)), input: (w) => ({ params: { id: w.id.juno! } }) },
};

export { consentOf, juno };
