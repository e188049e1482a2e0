import { listInWords } from '#shared/domain/words.ts';
import type { Db } from '../../db/index.ts';
import { findHeads, findProductionName } from '../productions/index.ts';

export interface Department {
  productionName: string | null;
  headNames: string[];
}

/** Who writes: the production and its department head(s), named in every mail to a performer or staff member. */
export async function findDepartment(db: Db, productionId: string | null): Promise<Department> {
  if (!productionId) return { productionName: null, headNames: [] };
  const [productionName, heads] = await Promise.all([findProductionName(db, productionId), findHeads(db, productionId)]);
  return { productionName, headNames: heads.map((h) => h.name).sort((a, b) => a.localeCompare(b)) };
}

/** "the make-up department of The Lantern Keeper (department head: Marta Oyelaran)". */
export function departmentInWords(d: Department): string {
  const of = d.productionName ? ` of ${d.productionName}` : '';
  const heads = d.headNames.length ? ` (department head${d.headNames.length > 1 ? 's' : ''}: ${listInWords(d.headNames)})` : '';
  return `the make-up department${of}${heads}`;
}

/** The closing lines of a mail: who it comes from. */
export function signOff(d: Department): string[] {
  return ['', '—', d.headNames.length ? `${listInWords(d.headNames)}, department head${d.headNames.length > 1 ? 's' : ''}` : 'The make-up department', d.productionName ?? 'Plinth'];
}
