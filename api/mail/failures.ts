import { openJson, sealJson } from '../crypto/medical.ts';
import type { Db } from '../db/index.ts';
import type { OutgoingMail } from './mailer.ts';

interface StoredAttachment {
  filename: string;
  contentBase64: string;
  contentType?: string;
}
type StoredMail = Omit<OutgoingMail, 'attachments'> & { attachments?: StoredAttachment[] };

function toStored(mail: OutgoingMail): StoredMail {
  return {
    ...mail,
    attachments: mail.attachments?.map((a) => ({ filename: a.filename, contentType: a.contentType, contentBase64: Buffer.from(a.content).toString('base64') })),
  };
}

function fromStored(raw: unknown): OutgoingMail {
  const m = raw as StoredMail;
  return { ...m, attachments: m.attachments?.map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.contentBase64, 'base64') })) };
}

/**
 * Keeps a message that could not be sent, whole, so it can be sent again later. It is sealed: a
 * signed copy attached to it carries health answers.
 */
export async function recordMailFailure(db: Db, mail: OutgoingMail, error: string): Promise<void> {
  await db
    .insertInto('mail_failures')
    .values({ message: JSON.stringify(sealJson(toStored(mail))), recipients: [mail.to].flat().join(', '), subject: mail.subject, error: error.slice(0, 500) })
    .execute();
}

export interface MailFailure {
  id: string;
  recipients: string;
  subject: string;
  error: string;
  attempts: number;
  failedAt: string;
}

/** Messages still not sent, newest first: who and what about, never their text or attachments. */
export async function listOpenMailFailures(db: Db): Promise<MailFailure[]> {
  const rows = await db
    .selectFrom('mail_failures')
    .select(['id', 'recipients', 'subject', 'error', 'attempts', 'failed_at'])
    .where('sent_at', 'is', null)
    .orderBy('failed_at', 'desc')
    .limit(200)
    .execute();
  return rows.map((r) => ({ id: r.id, recipients: r.recipients, subject: r.subject, error: r.error, attempts: r.attempts, failedAt: new Date(r.failed_at).toISOString() }));
}

export async function findOpenMailFailure(db: Db, id: string): Promise<OutgoingMail | undefined> {
  const r = await db.selectFrom('mail_failures').select('message').where('id', '=', id).where('sent_at', 'is', null).forUpdate().executeTakeFirst();
  return r ? fromStored(openJson(r.message)) : undefined;
}

export async function markMailFailure(db: Db, id: string, outcome: { sent: true } | { sent: false; error: string }): Promise<void> {
  if (outcome.sent) await db.updateTable('mail_failures').set({ sent_at: new Date() }).where('id', '=', id).execute();
  else await db.updateTable('mail_failures').set((eb) => ({ error: outcome.error.slice(0, 500), attempts: eb('attempts', '+', 1) })).where('id', '=', id).execute();
}
