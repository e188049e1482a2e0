import type { CurrentPlace, ConditionGrade, CastStatus } from '#shared/domain/archive-casts.ts';
import type { MovementKind } from '#shared/domain/archive-movements.ts';
import type { Db } from '../../db/index.ts';

/** One recorded move, as kept. */
export interface MovementRow {
  id: string;
  castId: string;
  kind: MovementKind;
  at: Date;
  movedBy: string;
  authorisedBy: string;
  from: CurrentPlace;
  to: CurrentPlace;
  fromLabel: string;
  toLabel: string;
  statusBefore: CastStatus;
  statusAfter: CastStatus;
  reason: string | null;
  dueBackAt: Date | null;
  witness: string | null;
  method: string | null;
  contact: string | null;
  note: string | null;
}

export interface NewMovement extends Omit<MovementRow, 'id'> {
  normalBefore: string | null;
  normalAfter: string | null;
  holderUserId: string | null;
  recordedBy: string | null;
}

export async function insertMovement(db: Db, m: NewMovement): Promise<string> {
  const row = await db
    .insertInto('cast_movements')
    .values({
      cast_id: m.castId,
      kind: m.kind,
      at: m.at,
      moved_by: m.movedBy,
      authorised_by: m.authorisedBy,
      from_place: JSON.stringify(m.from),
      to_place: JSON.stringify(m.to),
      from_label: m.fromLabel,
      to_label: m.toLabel,
      status_before: m.statusBefore,
      status_after: m.statusAfter,
      normal_before: m.normalBefore,
      normal_after: m.normalAfter,
      reason: m.reason,
      due_back_at: m.dueBackAt,
      witness: m.witness,
      method: m.method,
      contact: m.contact,
      note: m.note,
      holder_user_id: m.holderUserId,
      recorded_by: m.recordedBy,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** A cast's whole history, oldest first: every move is kept, none is ever changed. */
export async function listMovements(db: Db, castId: string): Promise<MovementRow[]> {
  const rows = await db.selectFrom('cast_movements').selectAll().where('cast_id', '=', castId).orderBy('at').orderBy('created_at').execute();
  return rows.map((r) => ({
    id: r.id,
    castId: r.cast_id,
    kind: r.kind,
    at: new Date(r.at),
    movedBy: r.moved_by,
    authorisedBy: r.authorised_by,
    from: r.from_place as CurrentPlace,
    to: r.to_place as CurrentPlace,
    fromLabel: r.from_label,
    toLabel: r.to_label,
    statusBefore: r.status_before,
    statusAfter: r.status_after,
    reason: r.reason,
    dueBackAt: r.due_back_at ? new Date(r.due_back_at) : null,
    witness: r.witness,
    method: r.method,
    contact: r.contact,
    note: r.note,
  }));
}

export interface ConditionCheckRow {
  id: string;
  castId: string;
  checkedOn: string;
  checkedBy: string;
  grade: ConditionGrade;
  notes: string | null;
}

export async function insertConditionCheck(db: Db, c: Omit<ConditionCheckRow, 'id'> & { createdBy: string | null }): Promise<string> {
  const row = await db
    .insertInto('cast_condition_checks')
    .values({ cast_id: c.castId, checked_on: c.checkedOn, checked_by: c.checkedBy, grade: c.grade, notes: c.notes, created_by: c.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Condition checks, newest first: the first is the cast's condition now. */
export async function listConditionChecks(db: Db, castId: string): Promise<ConditionCheckRow[]> {
  const rows = await db.selectFrom('cast_condition_checks').selectAll().where('cast_id', '=', castId).orderBy('checked_on', 'desc').orderBy('created_at', 'desc').execute();
  return rows.map((r) => ({ id: r.id, castId: r.cast_id, checkedOn: r.checked_on, checkedBy: r.checked_by, grade: r.grade, notes: r.notes }));
}

export async function findConditionCheck(db: Db, id: string): Promise<ConditionCheckRow | undefined> {
  const r = await db.selectFrom('cast_condition_checks').selectAll().where('id', '=', id).executeTakeFirst();
  return r ? { id: r.id, castId: r.cast_id, checkedOn: r.checked_on, checkedBy: r.checked_by, grade: r.grade, notes: r.notes } : undefined;
}

export interface PhotoRow {
  id: string;
  castId: string;
  conditionCheckId: string | null;
  fileId: string;
  thumbFileId: string;
  width: number;
  height: number;
  createdAt: Date;
}

function toPhoto(r: { id: string; cast_id: string; condition_check_id: string | null; file_id: string; thumb_file_id: string; width: number; height: number; created_at: Date }): PhotoRow {
  return { id: r.id, castId: r.cast_id, conditionCheckId: r.condition_check_id, fileId: r.file_id, thumbFileId: r.thumb_file_id, width: r.width, height: r.height, createdAt: new Date(r.created_at) };
}

export async function insertPhoto(db: Db, p: Omit<PhotoRow, 'id' | 'createdAt'> & { createdBy: string | null }): Promise<string> {
  const row = await db
    .insertInto('cast_photos')
    .values({ cast_id: p.castId, condition_check_id: p.conditionCheckId, file_id: p.fileId, thumb_file_id: p.thumbFileId, width: p.width, height: p.height, created_by: p.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function listPhotos(db: Db, castId: string): Promise<PhotoRow[]> {
  const rows = await db.selectFrom('cast_photos').selectAll().where('cast_id', '=', castId).orderBy('created_at').orderBy('id').execute();
  return rows.map(toPhoto);
}

export async function findPhoto(db: Db, castId: string, photoId: string): Promise<PhotoRow | undefined> {
  const r = await db.selectFrom('cast_photos').selectAll().where('id', '=', photoId).where('cast_id', '=', castId).executeTakeFirst();
  return r ? toPhoto(r) : undefined;
}

/** Removes a photo and its two file rows; the storage paths come back so the bytes can go after commit. */
export async function deletePhoto(db: Db, photo: PhotoRow): Promise<{ storagePath: string }[]> {
  await db.deleteFrom('cast_photos').where('id', '=', photo.id).execute();
  const rows = await db.deleteFrom('files').where('id', 'in', [photo.fileId, photo.thumbFileId]).returning('storage_path').execute();
  return rows.map((r) => ({ storagePath: r.storage_path }));
}
