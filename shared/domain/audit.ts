/**
 * Every event Plinth writes to its audit log, named `subject.verb` (present tense), with the
 * words the audit page shows for it. A new event is added here first; the type then lets it be written.
 */
export const AUDIT_ACTION_LABELS = {
  'auth.sign_in': 'Signed in',
  'auth.sign_in_refuse': 'Sign-in refused',
  'auth.sign_out': 'Signed out',
  'user.create': 'Added a user',
  'user.update': 'Changed a user',
  'production.create': 'Added a production',
  'production.update': 'Changed a production',
  'membership.add': 'Gave a role',
  'membership.remove': 'Took a role away',
  'lead.appoint': 'Appointed the designated lead',
  'lead.end': 'Ended the lead appointment',
  'performer.create': 'Registered a performer',
  'performer.update': 'Changed a performer',
  'performer.import': 'Imported performers',
  'performer.export': 'Exported performers',
  'performer.portrait_set': 'Set a portrait',
  'performer.portrait_remove': 'Removed a portrait',
  'performer.email_change': "Changed a performer's e-mail address",
  'performer.email_confirm': 'Performer confirmed their e-mail address',
  'performer.email_confirmation_send': 'Sent an address confirmation request',
  'performer.account_invite': 'Invited a performer to sign in',
  'performer.account_link': 'Performer linked a sign-in',
  'performer.account_unlink': 'Unlinked a sign-in',
  'performer.link_on_sign_in': 'Performer linked at sign-in',
  'engagement.add': 'Engaged a performer',
  'engagement.remove': 'Ended an engagement',
  'template.create': 'Created a consent form',
  'template.publish': 'Published a consent form version',
  'template.archive': 'Archived a consent form',
  'template.restore': 'Restored a consent form',
  'signing_request.create': 'Asked for a signature',
  'signing_request.cancel': 'Cancelled a signing request',
  'tablet.hand_over': 'Handed the tablet to a performer',
  'tablet.decline': 'Performer declined to sign on the tablet',
  'consent.sign': 'Consent signed',
  'consent.withdraw': 'Consent withdrawn',
  'consent.verify': 'Checked a consent PDF',
  'withdrawal_link.create': 'Sent a withdrawal link',
  'withdrawal_link.cap': 'Withheld a withdrawal link (too many asked)',
  'booking.create': 'Booked a session',
  'booking.cancel': 'Cancelled a session',
  'ingredient.create': 'Added an ingredient',
  'ingredient.update': 'Changed an ingredient',
  'product.create': 'Added a product',
  'product.update': 'Changed a product',
  'product.sds_upload': 'Uploaded a safety data sheet',
  'formulation.create': 'Recorded a new formulation',
  'formulation.record_ingredients': 'Recorded a formulation’s ingredients',
  'lot.create': 'Added a lot',
  'lot.update': 'Changed a lot',
  'lot.retire': 'Retired a lot',
  'lot.restore': 'Restored a lot',
  'protocol.update': 'Published a test protocol version',
  'medical.read': 'Read health details',
  'demo.seed': 'Loaded the demo scenario',
} as const;

export type AuditAction = keyof typeof AUDIT_ACTION_LABELS;
export const AUDIT_ACTIONS = Object.keys(AUDIT_ACTION_LABELS) as AuditAction[];

/** Words for an event code, including codes written before they were renamed. */
export function auditActionLabel(action: string): string {
  return (AUDIT_ACTION_LABELS as Record<string, string>)[action] ?? action.replace(/[._]/g, ' ');
}
