// The consent work around sessions: forms asked for in bundles, the notices of withdrawals and new
// health answers, the staff copy of a consent, and the booking checks and moves.
import { type Entries, onProduction, policy } from './entry.ts';
import { consentOf, juno } from './entries-people.ts';
import type { World } from './world.ts';

const UNKNOWN_TOKEN = 'x'.repeat(43);
const lantern = onProduction('lantern');
const lanternQuery = (w: World) => ({ query: { productionId: w.id.lantern! } });
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString();
const signature = {
  templateVersionId: '00000000-0000-4000-8000-000000000001',
  idempotencyKey: '00000000-0000-4000-8000-000000000002',
  signerName: 'Oswin Parfitt-Reyes',
  agreed: true,
  signaturePng: 'data:image/png;base64,iVBORw0KGgo=',
};

export const consentWorkEntries: Entries = {
  'POST /api/signing-bundles': {
    may: policy('consents.request', lantern),
    input: (w) => ({ body: { performerId: w.id.oz, productionId: w.id.lantern, templateIds: [w.id.template], mode: 'tablet' } }),
  },
  'POST /api/signing-bundles/:id/hand-over': { may: policy('consents.request', lantern), input: (w) => ({ params: { id: w.id.bundle! } }) },
  // One-time links: the token is the permission. An unknown one is refused alike for everyone.
  'GET /api/signing-bundles/link/:token': { public: 404, input: () => ({ params: { token: UNKNOWN_TOKEN } }) },
  'POST /api/signing-bundles/link/:token/requests/:requestId': {
    public: 404,
    input: (w) => ({ params: { token: UNKNOWN_TOKEN, requestId: w.id.signingRequest! }, body: signature }),
  },

  'GET /api/consent-notices/withdrawals': { may: policy('consents.request', lantern), input: lanternQuery },
  'POST /api/consent-notices/withdrawals/seen': { may: policy('consents.request', lantern), input: (w) => ({ body: { productionId: w.id.lantern, seenAt: new Date().toISOString() } }) },
  'GET /api/consent-notices/health': { may: policy('medical.read', lantern), input: lanternQuery, note: "the designated lead's worklist: the performer's own record is not the production's" },
  'POST /api/consent-notices/health/reviews': {
    may: policy('medical.read', lantern),
    input: (w) => ({ body: { performerId: w.id.juno, productionId: w.id.lantern, reviewedAt: new Date().toISOString() } }),
  },
  'GET /api/consent-notices/health-summary': { may: policy('medical.read', juno), input: (w) => ({ query: { performerId: w.id.juno! } }) },
  'GET /api/consents/:id/staff-pdf': { may: policy('consents.view', consentOf('juno')), input: (w) => ({ params: { id: w.id.junoMedicalConsent! } }), note: 'every health answer withheld' },

  'GET /api/bookings/consent-check': {
    may: policy('sessions.book', lantern),
    input: (w) => ({ query: { performerId: w.id.juno!, productionId: w.id.lantern!, purpose: 'application', startsAt: inDays(3) } }),
  },
  'GET /api/bookings/staff': { may: policy('sessions.book', lantern), input: lanternQuery },
  'POST /api/bookings/:id/reschedule': {
    may: policy('sessions.book', lantern),
    input: async (w) => {
      const { rows } = await w.t.db.pool.query<{ invitation_sequence: number }>(`select invitation_sequence from bookings where id = $1`, [w.id.booking]);
      return { params: { id: w.id.booking! }, body: { startsAt: inDays(2), location: 'Make-up room 2', sequence: rows[0]!.invitation_sequence } };
    },
  },
};
