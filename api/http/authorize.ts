import { type Action, type Actor, type Resource, can } from '#shared/policy.ts';
import { forbidden } from './errors.ts';

const ACTION_WORDS: Record<Action, string> = {
  'users.manage': 'manage users',
  'productions.manage': 'manage productions',
  'memberships.manage': 'manage who works on a production',
  'lead.appoint': 'appoint the designated lead',
  'audit.read': 'read the audit log',
  'outbox.read': 'read the outbox',
  'production.view': 'see this production',
  'performers.view': 'see performers',
  'performers.manage': 'manage performers',
  'consents.manage': 'manage consent forms',
  'consents.request': 'send signing requests',
  'medical.read': 'see health details',
  'medical.write': 'record health details',
  'catalogue.read': 'see the product catalogue',
  'catalogue.manage': 'manage the product catalogue',
  'protocols.manage': 'edit test protocols',
  'patchtests.book': 'book patch tests',
  'clearance.check': 'check clearances',
  'patchtests.read': 'see patch tests',
  'patchtests.record': 'record patch-test applications and readings',
  'clearance.override': 'override a clearance',
  'applications.log': 'log applications',
  'reactions.report': 'report reactions',
  'casts.read': 'see life casts',
  'casts.manage': 'manage life casts',
  'archive.view': 'use the life-cast archive',
  'locations.manage': 'manage the archive’s storage places',
  'performer.self': 'act for this performer',
  'performer.view': 'see this performer',
  'templates.manage': 'edit consent templates',
  'templates.read': 'see consent templates',
  'sessions.view': 'see sessions',
  'sessions.book': 'book sessions',
  'consents.view': 'see this consent',
  'consents.withdraw': 'withdraw this consent',
  'consents.verify': 'verify consent documents',
  'accounts.unlink': 'unlink the sign-in of this performer',
  'accounts.invite': 'invite this performer to sign in',
  'builds.read': 'see appliance builds',
  'builds.manage': 'record appliance builds and their pieces',
  'builds.plan': 'plan shoot days for appliances',
  'kits.manage': 'make and change kits',
  'applications.read': 'see logged applications',
  'lots.trace': 'trace a lot to the performers it touched',
};

/** Permission checked here: the only server wrapper around the policy. */
export function authorize(actor: Actor, action: Action, resource?: Resource): void {
  if (!can(actor, action, resource)) throw forbidden(ACTION_WORDS[action]);
}
