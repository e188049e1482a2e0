import { type RawBuilder, sql } from 'kysely';
import type { BookingPurpose } from '#shared/domain/bookings.ts';
import type { Db } from '../../db/index.ts';
import { bringsGateConsents, type GateConsentJson, gateConsentsJsonSql } from '../consents/index.ts';

export interface BookingRow {
  id: string;
  performerId: string;
  performerName: string;
  productionId: string;
  purpose: BookingPurpose;
  startsAt: Date;
  location: string | null;
  status: 'booked' | 'cancelled' | 'done';
  /** Changes sent to calendars so far; an edit names the one it was based on. */
  sequence: number;
  endsAt?: Date | null;
  artist?: { id: string; name: string } | null;
  /** The consents that can cover it, for the session gate, when the list brings them (`bringsGateConsents`); null otherwise. */
  gateConsents: GateConsentJson[] | null;
}

export interface BookingFilter {
  productionId?: string;
  /** Any of these productions (a performer page shows only those the viewer may see). */
  productionIds?: readonly string[];
  performerId?: string;
  from?: Date;
  to?: Date;
  ids?: readonly string[];
  status?: BookingRow['status'];
}

/** Sessions in start order (at most 500), with the performer's display name. */
export async function listBookingRows(db: Db, where: BookingFilter): Promise<BookingRow[]> {
  let q = db
    .selectFrom('bookings as b')
    .innerJoin('performers as p', 'p.id', 'b.performer_id')
    .leftJoin('users as a', 'a.id', 'b.artist_user_id')
    .select([
      'b.id',
      'b.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'b.production_id',
      'b.purpose',
      'b.starts_at',
      'b.ends_at',
      'b.location',
      'b.status',
      'a.id as artist_id',
      'a.display_name as artist_name',
      'b.invitation_sequence',
      (bringsGateConsents(where) ? gateConsentsJsonSql(sql.ref('b.performer_id'), sql.ref('b.production_id')) : sql<GateConsentJson[] | null>`null`).as('gate_consents'),
    ]);
  if (where.productionId) q = q.where('b.production_id', '=', where.productionId);
  if (where.productionIds) {
    if (where.productionIds.length === 0) return [];
    q = q.where('b.production_id', 'in', [...where.productionIds]);
  }
  if (where.performerId) q = q.where('b.performer_id', '=', where.performerId);
  if (where.from) q = q.where('b.starts_at', '>=', where.from);
  if (where.to) q = q.where('b.starts_at', '<', where.to);
  if (where.ids) {
    if (where.ids.length === 0) return [];
    q = q.where('b.id', 'in', [...where.ids]);
  }
  if (where.status) q = q.where('b.status', '=', where.status);
  const rows = await q.orderBy('b.starts_at').orderBy('b.id').limit(500).execute();
  return rows.map((r) => ({
    id: r.id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    purpose: r.purpose,
    startsAt: new Date(r.starts_at),
    location: r.location,
    status: r.status,
    sequence: r.invitation_sequence,
    endsAt: r.ends_at ? new Date(r.ends_at) : null,
    artist: r.artist_id && r.artist_name ? { id: r.artist_id, name: r.artist_name } : null,
    gateConsents: r.gate_consents,
  }));
}

export async function findBookingForChange(
  db: Db,
  id: string,
): Promise<{ id: string; productionId: string; purpose: BookingPurpose; status: BookingRow['status']; sequence: number; startsAt: Date; location: string | null } | undefined> {
  const r = await db.selectFrom('bookings').select(['id', 'production_id', 'purpose', 'status', 'invitation_sequence', 'starts_at', 'location']).where('id', '=', id).forUpdate().executeTakeFirst();
  return r ? { id: r.id, productionId: r.production_id, purpose: r.purpose, status: r.status, sequence: r.invitation_sequence, startsAt: new Date(r.starts_at), location: r.location } : undefined;
}

export async function findBookingProduction(db: Db, id: string): Promise<string | undefined> {
  return (await db.selectFrom('bookings').select('production_id').where('id', '=', id).executeTakeFirst())?.production_id;
}

export async function insertBooking(
  db: Db,
  v: { performerId: string; productionId: string; purpose: BookingPurpose; startsAt: Date; location: string | null; createdBy: string; endsAt?: Date | null; artistUserId?: string | null },
): Promise<string> {
  const row = await db
    .insertInto('bookings')
    .values({
      performer_id: v.performerId,
      production_id: v.productionId,
      purpose: v.purpose,
      starts_at: v.startsAt,
      location: v.location,
      created_by: v.createdBy,
      ends_at: v.endsAt ?? null,
      artist_user_id: v.artistUserId ?? null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function setBookingStatus(db: Db, id: string, status: BookingRow['status']): Promise<void> {
  await db.updateTable('bookings').set({ status }).where('id', '=', id).execute();
}

/** A session as the JSON fragment below returns it. */
export interface BookingJsonRow {
  id: string;
  production_id: string;
  purpose: BookingPurpose;
  starts_at: string;
  location: string | null;
  status: BookingRow['status'];
  sequence: number;
  ends_at?: string | null;
}

/** The booked sessions of the performer whose id is `performerId` starting from `from`, in start order, as a JSON array. */
export function upcomingBookingsJsonSql(performerId: RawBuilder<string>, from: Date): RawBuilder<BookingJsonRow[]> {
  return sql<BookingJsonRow[]>`coalesce((
    select json_agg(json_build_object('id', b.id, 'production_id', b.production_id, 'purpose', b.purpose, 'starts_at', b.starts_at, 'ends_at', b.ends_at, 'location', b.location, 'status', b.status, 'sequence', b.invitation_sequence) order by b.starts_at, b.id)
    from bookings b where b.performer_id = ${performerId} and b.status = 'booked' and b.starts_at >= ${from}
  ), '[]'::json)`;
}

export interface BookingForInvitation {
  id: string;
  performerId: string;
  productionId: string;
  productionName: string;
  purpose: BookingPurpose;
  startsAt: Date;
  /** The end booked for the session, when one was. */
  endsAt: Date | null;
  location: string | null;
  status: BookingRow['status'];
  invitationSequence: number;
}

/** What a session's calendar invitation says, with its production's name. */
export async function findBookingForInvitation(db: Db, id: string): Promise<BookingForInvitation | undefined> {
  const r = await db
    .selectFrom('bookings as b')
    .innerJoin('productions as pr', 'pr.id', 'b.production_id')
    .select(['b.id', 'b.performer_id', 'b.production_id', 'pr.name as production_name', 'b.purpose', 'b.starts_at', 'b.ends_at', 'b.location', 'b.status', 'b.invitation_sequence'])
    .where('b.id', '=', id)
    .executeTakeFirst();
  return r
    ? { id: r.id, performerId: r.performer_id, productionId: r.production_id, productionName: r.production_name, purpose: r.purpose, startsAt: new Date(r.starts_at), endsAt: r.ends_at ? new Date(r.ends_at) : null, location: r.location, status: r.status, invitationSequence: r.invitation_sequence }
    : undefined;
}

/** A change the calendar must hear of: the next SEQUENCE, in the change's own transaction. */
export async function bumpInvitationSequence(db: Db, id: string): Promise<number> {
  const r = await db.updateTable('bookings').set((eb) => ({ invitation_sequence: eb('invitation_sequence', '+', 1) })).where('id', '=', id).returning('invitation_sequence').executeTakeFirstOrThrow();
  return r.invitation_sequence;
}

/** Moves a booked session; the caller holds the row (`findBookingForChange`). */
export async function moveBooking(db: Db, id: string, v: { startsAt: Date; location: string | null }): Promise<void> {
  await setBookingTime(db, id, v.startsAt, v.location);
}

/** Moves a booked session to another time or place. */
export async function setBookingTime(db: Db, id: string, startsAt: Date, location: string | null): Promise<void> {
  // The session keeps its length: a recorded end moves with the start.
  await db
    .updateTable('bookings')
    .set({ starts_at: startsAt, location, ends_at: sql<Date | null>`ends_at + (${startsAt}::timestamptz - starts_at)` })
    .where('id', '=', id)
    .execute();
}
