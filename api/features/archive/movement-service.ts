import type { Request } from 'express';
import { applyMovement, MOVEMENT_KIND_LABELS, type Movement, type PlaceRef } from '#shared/domain/archive-movements.ts';
import type { Actor } from '#shared/policy.ts';
import type { MovementInput } from '#shared/schemas/archive.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { staffOf } from '../productions/index.ts';
import { loadCastFor, placeText, stateOf, whereaboutsOf } from './cast-view.ts';
import { lockCast, setWhereaboutsAtVersion } from './repo-casts.ts';
import { insertMovement } from './repo-history.ts';
import { listLocations, type LocationRecord } from './repo-locations.ts';

function placeRefOf(tree: readonly LocationRecord[], id: string | null | undefined): PlaceRef | null | 'missing' {
  if (!id) return null;
  const place = tree.find((l) => l.id === id);
  return place ? { id: place.id, level: place.level } : 'missing';
}

/**
 * Records one move of a cast, by the archive's rules: who moved it and who authorised it, from
 * where to where, and when. The cast's one current place and the history line change together,
 * in one transaction, or not at all.
 */
export async function recordMovement(db: Db, actor: Actor, id: string, input: MovementInput, req: Request, now = new Date()): Promise<void> {
  const { resource } = await loadCastFor(db, actor, id, 'casts.manage');
  await db.transaction().execute(async (trx) => {
    const cast = await lockCast(trx, id);
    if (!cast) throw notFound('That cast');
    if (cast.version !== input.version) throw conflict('Someone else moved or changed this cast since you opened it. Reload to see where it is now.', { currentVersion: cast.version });
    const tree = await listLocations(trx);
    const base = { movedBy: input.movedBy, authorisedBy: input.authorisedBy, at: input.at ? new Date(input.at) : now, note: input.note };
    let movement: Movement;
    let holderUserId: string | null = null;
    switch (input.kind) {
      case 'check_out': {
        let holder = input.holder;
        if (input.holderUserId) {
          const staff = await staffOf(trx, [...new Set([resource.productionId!, ...(resource.performerProductionIds ?? [])])]);
          const person = staff.find((s) => s.userId === input.holderUserId);
          if (!person) throw invalid({ holderUserId: ['Choose someone who works on this cast’s productions.'] });
          holder = person.name;
          holderUserId = person.userId;
        }
        movement = { ...base, kind: 'check_out', holder, reason: input.reason, dueBackAt: input.dueBackAt ? new Date(input.dueBackAt) : null };
        break;
      }
      case 'check_in':
      case 'relocation': {
        const to = placeRefOf(tree, input.to);
        if (to === 'missing') throw invalid({ to: ['That place was not found.'] });
        movement = input.kind === 'check_in' ? { ...base, kind: 'check_in', to } : { ...base, kind: 'relocation', to, alsoNormal: input.alsoNormal, reason: input.reason };
        break;
      }
      case 'loan':
        movement = { ...base, kind: 'loan', production: input.production, contact: input.contact, reason: input.reason, dueBackAt: input.dueBackAt ? new Date(input.dueBackAt) : null };
        break;
      case 'return_to_performer':
        movement = { ...base, kind: 'return_to_performer', reason: input.reason };
        break;
      case 'destruction':
        movement = { ...base, kind: 'destruction', witness: input.witness, reason: input.reason, method: input.method };
        break;
    }
    const outcome = applyMovement(stateOf(cast), movement, now);
    if (!outcome.ok) {
      const whole = outcome.errors['']?.[0];
      throw invalid(outcome.errors, whole ?? `The ${MOVEMENT_KIND_LABELS[input.kind].toLowerCase()} cannot be recorded as given.`);
    }
    const { record, state } = outcome;
    await insertMovement(trx, {
      castId: id,
      kind: record.kind,
      at: record.at,
      movedBy: record.movedBy,
      authorisedBy: record.authorisedBy,
      from: record.from,
      to: record.to,
      fromLabel: placeText(record.from, tree),
      toLabel: placeText(record.to, tree),
      statusBefore: record.statusBefore,
      statusAfter: record.statusAfter,
      normalBefore: record.normalLocationBefore,
      normalAfter: record.normalLocationAfter,
      reason: record.reason,
      dueBackAt: record.dueBackAt,
      witness: record.witness,
      method: input.kind === 'destruction' ? input.method : null,
      contact: input.kind === 'loan' ? input.contact : null,
      note: record.note,
      holderUserId,
      recordedBy: actor.userId,
    });
    if (!(await setWhereaboutsAtVersion(trx, id, whereaboutsOf(state, holderUserId), input.version))) {
      throw conflict('Someone else moved or changed this cast since you opened it. Reload to see where it is now.', { currentVersion: cast.version });
    }
    await writeAudit(trx, {
      actorUserId: actor.userId,
      action: 'cast.move',
      entityType: 'cast',
      entityId: id,
      productionId: cast.productionId,
      req,
      details: { kind: record.kind, statusBefore: record.statusBefore, statusAfter: record.statusAfter, movedBy: record.movedBy, authorisedBy: record.authorisedBy, witness: record.witness },
    });
  });
}
