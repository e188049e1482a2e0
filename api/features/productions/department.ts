import { listInWords } from '#shared/domain/words.ts';
import type { Db } from '../../db/index.ts';
import { findHeads, productionNames } from './repo.ts';

/** Who a mail comes from: a production and its department head(s), as its memberships say now. */
export interface Department {
  productionName: string | null;
  headNames: string[];
}

const NONE: Department = { productionName: null, headNames: [] };

/** The departments of these productions, in the order of their names (a performer may work on several). */
export async function findDepartments(db: Db, productionIds: readonly (string | null)[]): Promise<Department[]> {
  const ids = [...new Set(productionIds.filter((id): id is string => Boolean(id)))];
  if (ids.length === 0) return [];
  const [names, heads] = await Promise.all([productionNames(db, ids), Promise.all(ids.map((id) => findHeads(db, id)))]);
  return ids
    .map((id, i) => ({ productionName: names.get(id) ?? null, headNames: heads[i]!.map((h) => h.name).sort((a, b) => a.localeCompare(b)) }))
    .filter((d) => d.productionName !== null)
    .sort((a, b) => a.productionName!.localeCompare(b.productionName!));
}

/** The production and its department head(s), for every mail about one production. */
export async function findDepartment(db: Db, productionId: string | null): Promise<Department> {
  return (await findDepartments(db, [productionId]))[0] ?? NONE;
}

const headsLabel = (d: Department) => `department head${d.headNames.length > 1 ? 's' : ''}`;

/** "the make-up department of The Lantern Keeper (department head: Marta Oyelaran)", for a sentence. */
export function departmentInWords(d: Department): string {
  const of = d.productionName ? ` of ${d.productionName}` : '';
  const heads = d.headNames.length ? ` (${headsLabel(d)}: ${listInWords(d.headNames)})` : '';
  return `the make-up department${of}${heads}`;
}

/** "Production: The Lantern Keeper · Department head: Marta Oyelaran". */
export function departmentLine(d: Department): string {
  const heads = d.headNames.length ? listInWords(d.headNames) : 'not appointed yet';
  return `Production: ${d.productionName ?? 'none named'} · ${headsLabel(d).replace(/^d/, 'D')}: ${heads}`;
}

/** The closing lines of every mail Plinth sends: which production it is about, and who heads its department. */
export function mailFooter(deps: Department | readonly Department[]): string[] {
  const list = (Array.isArray(deps) ? deps : [deps]).filter((d: Department) => d.productionName !== null);
  return ['', '—', ...(list.length ? list.map(departmentLine) : ['The make-up department, through Plinth'])];
}
