import { randomInt } from 'node:crypto';
import { LABEL_CODE_SPACE, labelCodeFromNumber, type LabelTarget } from '#shared/domain/label-codes.ts';
import type { Db } from '../../db/index.ts';
import { castLabelTaken } from './repo-casts.ts';
import { locationLabelTaken } from './repo-locations.ts';

/**
 * A fresh label code: drawn at random (neighbouring labels should not look alike) and drawn again
 * if taken. With 33.5 million codes per kind a second draw is already rare.
 */
export async function newLabelCode(db: Db, target: LabelTarget): Promise<string> {
  for (let attempt = 0; attempt < 20; attempt++) {
    const code = labelCodeFromNumber(target, randomInt(LABEL_CODE_SPACE));
    const taken = target === 'cast' ? await castLabelTaken(db, code) : await locationLabelTaken(db, code);
    if (!taken) return code;
  }
  throw new Error('no free label code found');
}
