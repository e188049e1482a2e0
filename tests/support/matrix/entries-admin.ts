// Studio-wide routes (the administrator's), the session, health and sign-in.
import { rolesOn } from '#shared/policy.ts';
import { type Entries, onProduction, policy } from './entry.ts';

const UNKNOWN_TOKEN = 'x'.repeat(43);

export const adminEntries: Entries = {
  'GET /api/health': { public: 200 },
  'GET /api/openapi.json': { public: 200 },
  'GET /api/auth/login': { public: 503, note: 'no identity provider runs beside this test, and the route says so' },
  'GET /api/auth/callback': { public: 401, note: 'no sign-in under way: a page saying the sign-in was not completed' },
  'POST /api/auth/logout': { public: 200 },
  'GET /api/session': {},
  'PUT /api/session/current': {
    may: (a, w) => rolesOn(a, w.id.lantern!).includes('head'),
    refused: 400,
    input: (w) => ({ body: { productionId: w.id.lantern, role: 'head' } }),
    note: 'a seat the person does not hold is a 400 naming the role',
  },
  'GET /api/home': {},
  'GET /api/users': {},
  'GET /api/users/:id': { input: (w) => ({ params: { id: w.id.artistUser! } }) },
  'POST /api/users': { input: () => ({ body: { email: 'new.dresser@plinth.test', displayName: 'Ada Fenwick' } }) },
  'PATCH /api/users/:id': {
    input: async (w) => ({ params: { id: w.id.artistUser! }, body: { displayName: 'Rafe Lindqvist', isAdmin: false, version: await w.version('users', w.id.artistUser!) } }),
  },
  'POST /api/users/:id/sessions/end': { input: (w) => ({ params: { id: w.id.artistUser! } }) },
  'GET /api/productions': {},
  'GET /api/productions/:id': { input: (w) => ({ params: { id: w.id.lantern! } }) },
  'POST /api/productions': { input: () => ({ body: { name: 'The Tin Orchard', kind: 'film' } }) },
  'PATCH /api/productions/:id': {
    input: async (w) => ({
      params: { id: w.id.saltglass! },
      body: { name: 'Saltglass Mile', kind: 'television', startsOn: '2027-01-11', endsOn: '2027-06-25', version: await w.version('productions', w.id.saltglass!) },
    }),
  },
  'POST /api/productions/:id/memberships': { input: (w) => ({ params: { id: w.id.lantern! }, body: { userId: w.id.noroleUser, role: 'artist' } }) },
  'DELETE /api/productions/:id/memberships/:membershipId': { input: (w) => ({ params: { id: w.id.lantern!, membershipId: w.id.membership! } }) },
  'POST /api/productions/:id/lead': {
    input: async (w) => ({ params: { id: w.id.lantern! }, body: { userId: w.id.artistUser, version: await w.version('productions', w.id.lantern!) } }),
  },
  'DELETE /api/productions/:id/lead': { input: async (w) => ({ params: { id: w.id.lantern! }, query: { version: await w.version('productions', w.id.lantern!) } }) },
  'GET /api/outbox': {},
  'GET /api/outbox/failures': {},
  'POST /api/outbox/failures/:id/retry': { input: (w) => ({ params: { id: w.id.mailFailure! } }) },
  'GET /api/outbox/:id': { input: (w) => ({ params: { id: w.id.mailFile! } }) },
  'GET /api/audit': {
    may: policy('audit.review', onProduction('lantern')),
    input: (w) => ({ query: { production: w.id.lantern!, action: 'consent.', from: '2020-01-01' } }),
    note: "the first production's part of the log: its lead and the administrator; the other production's lead is refused",
  },
  // One-time links: the token is the permission. An unknown one is refused alike for everyone.
  'GET /api/email-confirmations/:token': { public: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }) },
  'POST /api/email-confirmations/:token': { public: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }) },
  'GET /api/account-invitations/:token': { public: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }) },
  'POST /api/account-invitations/:token/accept': { ok: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }), note: 'an unknown invitation, whoever accepts it' },
  'GET /api/signing/:token': { public: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }) },
  'POST /api/signing/:token': {
    public: 404,
    input: () => ({
      params: { token: UNKNOWN_TOKEN },
      body: { templateVersionId: '00000000-0000-4000-8000-000000000001', idempotencyKey: '00000000-0000-4000-8000-000000000002', signerName: 'Juno Castellane', agreed: true, signaturePng: 'data:image/png;base64,iVBORw0KGgo=' },
    }),
  },
  'GET /api/withdrawal-links/:token': { public: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }) },
  'POST /api/withdrawal-links/:token/withdraw': { public: 404, input: (w) => ({ params: { token: UNKNOWN_TOKEN }, body: { consentId: w.id.ozConsent } }) },
  'POST /api/withdrawal-links': { public: 202, input: () => ({ body: { email: 'oz.parfitt@example.test' } }) },
  // The tablet acts only for a session lent to a performer for signing; no one here holds one.
  'GET /api/tablet': { public: 200, note: 'phase "none", with no form' },
  'POST /api/tablet/submit': {
    public: 401,
    input: () => ({
      body: { templateVersionId: '00000000-0000-4000-8000-000000000001', idempotencyKey: '00000000-0000-4000-8000-000000000002', signerName: 'Juno Castellane', agreed: true, signaturePng: 'data:image/png;base64,iVBORw0KGgo=' },
    }),
  },
  'POST /api/tablet/decline': { public: 401 },
};
