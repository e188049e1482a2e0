// The artist's check: kits, checks, questions to the designated lead, the application log with its
// skin checks and incidents, a lot's trace and the performer's card.
import { type Action, can } from '#shared/policy.ts';
import { type Check, type Entries, onProduction, policy, today } from './entry.ts';
import type { World } from './world.ts';

const lantern = onProduction('lantern');
const lanternQuery = (w: World) => ({ query: { productionId: w.id.lantern! } });
/** The record as the handler names it to the policy: the production and the performer, no more. */
const junoOnLantern = (w: World) => ({ productionId: w.id.lantern!, performerId: w.id.juno! });

/** A lot's trace: refused only to one who may trace lots on none of their productions. */
const tracesAnywhere: Check = Object.assign(
  (a: Parameters<Check>[0]) => [...a.memberships.map((m) => m.productionId), ...a.leadOf].some((productionId) => can(a, 'lots.trace', { productionId })),
  { actions: ['lots.trace'] as readonly Action[] },
);

export const checksEntries: Entries = {
  'GET /api/kits': { may: policy('clearance.check', lantern), input: lanternQuery },
  'POST /api/kits': {
    may: policy('kits.manage', lantern),
    input: async (w) => {
      const { rows } = await w.t.db.pool.query<{ id: string }>(`select id from products where name in ('Tern gentle skin cleanser', 'Dune barrier cream') order by name`);
      return { body: { productionId: w.id.lantern, name: 'Night shoot base', productIds: rows.map((r) => r.id) } };
    },
  },
  'GET /api/kits/:id': { may: policy('clearance.check', lantern), input: (w) => ({ params: { id: w.id.kit! } }) },
  'PUT /api/kits/:id': {
    may: policy('kits.manage', lantern),
    input: async (w) => {
      const { rows } = await w.t.db.pool.query<{ product_id: string }>(`select product_id from kit_products where kit_id = $1 order by position`, [w.id.kit]);
      return { params: { id: w.id.kit! }, body: { name: 'Day 12 — scar appliance (revised)', productIds: rows.map((r) => r.product_id), version: await w.version('kits', w.id.kit!) } };
    },
  },

  'GET /api/checks/pieces': { may: policy('clearance.check', lantern), input: (w) => ({ query: { productionId: w.id.lantern!, performerId: w.id.juno! } }) },
  'GET /api/checks/waiting': { may: policy('clearance.check', lantern), input: lanternQuery },
  'POST /api/checks': { may: policy('clearance.check', lantern), input: (w) => ({ body: { productionId: w.id.lantern, performerId: w.id.juno, kitId: w.id.kit } }) },
  'GET /api/checks/:id': { may: policy('clearance.check', lantern), input: (w) => ({ params: { id: w.id.check! } }) },
  'POST /api/checks/:id/requests': {
    may: policy('clearance.check', lantern),
    input: (w) => ({ params: { id: w.id.cautionCheck! }, body: { formulationId: w.id.cautionFormulation } }),
  },

  'GET /api/lead-requests': { may: policy('medical.write', lantern), input: lanternQuery },
  'GET /api/lead-requests/:id': { may: policy('medical.write', lantern), input: (w) => ({ params: { id: w.id.leadRequest! } }) },
  'POST /api/lead-requests/:id/decision': {
    may: policy('medical.write', junoOnLantern),
    input: async (w) => ({ params: { id: w.id.leadRequest! }, body: { decision: 'approved', note: 'Fine for a short day with a barrier first', version: await w.version('lead_requests', w.id.leadRequest!) } }),
  },

  'GET /api/performers/:id/card.pdf': { may: policy('performers.view', (w) => w.performer(w.id.juno!)), input: (w) => ({ params: { id: w.id.juno! } }) },
  'GET /api/performers/:id/card.png': { may: policy('performers.view', (w) => w.performer(w.id.juno!)), input: (w) => ({ params: { id: w.id.juno! } }) },

  'GET /api/applications': { may: policy('applications.read', lantern), input: lanternQuery },
  'POST /api/applications': {
    may: policy('applications.log', lantern),
    input: (w) => {
      const startedAt = new Date().toISOString();
      return { body: { checkId: w.id.goCheck, appliedOn: today(), description: 'Scar appliance along the left jaw', products: JSON.parse(w.id.applied!), startedAt } };
    },
  },
  'GET /api/applications/:id': { may: policy('applications.read', lantern), input: (w) => ({ params: { id: w.id.application! } }) },
  'POST /api/applications/:id/end': {
    may: policy('applications.log', lantern),
    input: async (w) => ({
      params: { id: w.id.openApplication! },
      body: { endedAt: new Date().toISOString(), removalProducts: JSON.parse(w.id.removal!), version: await w.version('applications', w.id.openApplication!) },
    }),
  },
  'POST /api/applications/:id/skin-check': { may: policy('applications.log', lantern), input: (w) => ({ params: { id: w.id.endedApplication! }, body: { outcome: 'clear' } }) },

  'GET /api/incidents': { may: policy('medical.read', lantern), input: lanternQuery },
  'GET /api/incidents/:id': { may: policy('medical.read', junoOnLantern), input: (w) => ({ params: { id: w.id.incident! } }) },
  'POST /api/incidents/:id/close': {
    may: policy('medical.write', junoOnLantern),
    input: async (w) => ({ params: { id: w.id.incident! }, body: { note: 'Settled by the next morning; barrier cream before the edge from now on', version: await w.version('incidents', w.id.incident!) } }),
  },
  'GET /api/lots/:id/trace': { may: tracesAnywhere, input: (w) => ({ params: { id: w.id.traceLot! } }) },
};
