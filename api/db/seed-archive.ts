// Writes the archive's demo data (api/db/seed-archive-data.ts) into the database: places, casts
// in the states their moves left them in, every move, condition checks, and drawn photos.
import sharp from 'sharp';
import type { CurrentPlace } from '#shared/domain/archive-casts.ts';
import { placeText, whereaboutsOf } from '../features/archive/cast-view.ts';
import { processPhoto } from '../files/photos.ts';
import { type FileStore, storeFile } from '../files/store.ts';
import type { Db } from './index.ts';
import {
  ARCHIVE_DEMO_CONDITION_CHECKS,
  ARCHIVE_DEMO_LOCATION_LABELS,
  ARCHIVE_DEMO_LOCATIONS,
  ARCHIVE_DEMO_PERFORMERS,
  buildArchiveDemo,
  placeholderPhotoSvg,
  type DemoProductionKey,
} from './seed-archive-data.ts';

export interface ArchiveSeedIds {
  /** DEMO_USERS keys to user ids and names. */
  users: Map<string, { id: string; name: string }>;
  /** Legal names to performer ids. */
  performers: Map<string, string>;
  productions: Record<DemoProductionKey, string>;
  now: Date;
}

const DAY = 86_400_000;
const TREE = ARCHIVE_DEMO_LOCATIONS.map((l) => ({ id: l.key, parentId: l.parentKey, level: l.level, code: l.code, name: l.name }));

/** Places, casts, movements and condition checks, inside the seed's one transaction. */
export async function seedArchiveRecords(trx: Db, ids: ArchiveSeedIds): Promise<void> {
  const name = (key: string) => ids.users.get(key)?.name ?? key;
  const userByName = new Map([...ids.users.values()].map((u) => [u.name, u.id]));
  const place = new Map<string, string>();
  for (const l of ARCHIVE_DEMO_LOCATIONS) {
    const row = await trx
      .insertInto('archive_locations')
      .values({ parent_id: l.parentKey ? place.get(l.parentKey)! : null, level: l.level, code: l.code, name: l.name, environment: l.environment, label_code: ARCHIVE_DEMO_LOCATION_LABELS[l.key]! })
      .returning('id')
      .executeTakeFirstOrThrow();
    place.set(l.key, row.id);
  }
  const toIds = (p: CurrentPlace): CurrentPlace => (p.kind === 'location' ? { kind: 'location', locationId: place.get(p.locationId)! } : p);
  const performerId = new Map(ARCHIVE_DEMO_PERFORMERS.map((p) => [p.key, ids.performers.get(p.legalName)!]));
  const cast = new Map<string, string>();
  const plan = buildArchiveDemo(ids.now);
  // Molds first, so every positive and core can name the mold it was poured from.
  for (const { cast: c, madeOn, state } of [...plan].sort((a, b) => Number(Boolean(a.cast.pouredFromKey)) - Number(Boolean(b.cast.pouredFromKey)))) {
    const stored = whereaboutsOf(
      { ...state, current: toIds(state.current), normalLocationId: state.normalLocationId ? place.get(state.normalLocationId)! : null },
      state.current.kind === 'person' ? (userByName.get(state.current.holder) ?? null) : null,
    );
    const row = await trx
      .insertInto('casts')
      .values({
        label_code: c.labelCode,
        performer_id: performerId.get(c.performerKey)!,
        production_id: ids.productions[c.productionKey],
        region: c.region,
        kind: c.kind,
        material: c.material,
        made_on: madeOn.toISOString().slice(0, 10),
        made_by: name(c.madeBy),
        poured_from_id: c.pouredFromKey ? cast.get(c.pouredFromKey)! : null,
        status: stored.status,
        normal_location_id: stored.normalLocationId,
        current_location_id: stored.currentLocationId,
        current_holder: stored.currentHolder,
        current_holder_user_id: stored.currentHolderUserId,
        current_production: stored.currentProduction,
        due_back_at: stored.dueBackAt,
        since: stored.since,
        notes: c.notes,
        created_by: ids.users.get('archivist')?.id ?? null,
        created_at: madeOn,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    cast.set(c.key, row.id);
  }
  for (const { cast: c, records } of plan) {
    for (const r of records) {
      await trx
        .insertInto('cast_movements')
        .values({
          cast_id: cast.get(c.key)!,
          kind: r.kind,
          at: r.at,
          moved_by: name(r.movedBy),
          authorised_by: name(r.authorisedBy),
          from_place: JSON.stringify(toIds(r.from)),
          to_place: JSON.stringify(toIds(r.to)),
          from_label: placeText(r.from, TREE),
          to_label: placeText(r.to, TREE),
          status_before: r.statusBefore,
          status_after: r.statusAfter,
          normal_before: r.normalLocationBefore ? place.get(r.normalLocationBefore)! : null,
          normal_after: r.normalLocationAfter ? place.get(r.normalLocationAfter)! : null,
          reason: r.reason,
          due_back_at: r.dueBackAt,
          witness: r.witness ? name(r.witness) : null,
          note: r.note,
          holder_user_id: r.to.kind === 'person' ? (userByName.get(r.to.holder) ?? null) : null,
          recorded_by: ids.users.get('archivist')?.id ?? null,
          created_at: r.at,
        })
        .execute();
    }
  }
  for (const k of ARCHIVE_DEMO_CONDITION_CHECKS) {
    const at = new Date(ids.now.getTime() - k.daysAgo * DAY);
    await trx
      .insertInto('cast_condition_checks')
      .values({ cast_id: cast.get(k.castKey)!, checked_on: at.toISOString().slice(0, 10), checked_by: name(k.checkedBy), grade: k.grade, notes: k.notes, created_by: ids.users.get('archivist')?.id ?? null, created_at: at })
      .execute();
  }
}

/** A drawn photo of every cast (and of the poor condition seen on one), stored like an upload. */
export async function seedArchivePhotos(db: Db, store: FileStore): Promise<void> {
  const casts = await db.selectFrom('casts').select(['id', 'label_code', 'region', 'kind', 'created_by']).orderBy('label_code').execute();
  const checks = await db.selectFrom('cast_condition_checks').select(['id', 'cast_id']).where('grade', 'in', ['poor', 'damaged']).execute();
  let variant = 0;
  for (const c of casts) {
    const shots = [null, ...checks.filter((k) => k.cast_id === c.id).map((k) => k.id)];
    for (const checkId of shots) {
      const png = await sharp(Buffer.from(placeholderPhotoSvg({ region: c.region, kind: c.kind, variant: variant++ }))).png().toBuffer();
      const { photo, thumbnail } = await processPhoto(png, 'photo');
      await db.transaction().execute(async (trx) => {
        const big = await storeFile(trx, store, { purpose: 'cast_photo', contentType: 'image/jpeg', ext: 'jpg', bytes: photo.bytes, width: photo.width, height: photo.height, createdBy: c.created_by });
        const small = await storeFile(trx, store, { purpose: 'cast_photo_thumb', contentType: 'image/jpeg', ext: 'jpg', bytes: thumbnail.bytes, width: thumbnail.width, height: thumbnail.height, createdBy: c.created_by });
        await trx
          .insertInto('cast_photos')
          .values({ cast_id: c.id, condition_check_id: checkId, file_id: big.id, thumb_file_id: small.id, width: photo.width, height: photo.height, created_by: c.created_by })
          .execute();
      });
    }
  }
}
