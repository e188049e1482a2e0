/** The product catalogue's fixed vocabularies, and when a lot may still be used. */

export const PRODUCT_CATEGORIES = [
  'adhesive',
  'remover',
  'sealer',
  'barrier',
  'paint',
  'pigment',
  'silicone',
  'foam_latex',
  'cap_material',
  'cleanser',
  'powder',
  'other',
] as const;
/** What a product is for in the department. */
export type ProductCategory = (typeof PRODUCT_CATEGORIES)[number];

/** Product categories in plain words. */
export const PRODUCT_CATEGORY_LABELS: Record<ProductCategory, string> = {
  adhesive: 'Adhesive',
  remover: 'Remover',
  sealer: 'Sealer',
  barrier: 'Barrier',
  paint: 'Paint',
  pigment: 'Pigment',
  silicone: 'Silicone',
  foam_latex: 'Foam latex',
  cap_material: 'Cap material',
  cleanser: 'Cleanser',
  powder: 'Powder',
  other: 'Other',
};

/** Whether a product stays on the skin or is washed or wiped off; fragrance-allergen labelling thresholds differ between them. */
export const EXPOSURE_TYPES = ['leave_on', 'rinse_off'] as const;
/** Leave-on or rinse-off. */
export type ExposureType = (typeof EXPOSURE_TYPES)[number];

/** Exposure types in plain words. */
export const EXPOSURE_TYPE_LABELS: Record<ExposureType, string> = {
  leave_on: 'Leave-on',
  rinse_off: 'Rinse-off',
};

/**
 * A lot's expiry date is its last day of use: it is expired from the start of the next day (UTC), so a lot
 * marked 2026-11-30 is still usable on that day and expired on 2026-12-01.
 */
export function lotExpired(expiresOn: string | null, at: Date): boolean {
  if (expiresOn === null) return false;
  const end = Date.parse(`${expiresOn}T00:00:00Z`) + 86_400_000;
  return at.getTime() >= end;
}

/** Where a lot stands: in date, close to its last day, past it, or taken out of use by the department. */
export const LOT_STATES = ['in_date', 'expiring', 'expired', 'retired'] as const;
/** One lot state. */
export type LotState = (typeof LOT_STATES)[number];

/** Lot states in plain words; the screen shows them with an icon as well as a colour. */
export const LOT_STATE_LABELS: Record<LotState, string> = {
  in_date: 'In date',
  expiring: 'Expires soon',
  expired: 'Expired',
  retired: 'Retired',
};

/** A lot within this many days of its last day of use is flagged, so it is used or replaced in time. */
export const LOT_EXPIRING_DAYS = 30;

/** A retired lot is out of use whatever its date; otherwise expiry (`lotExpired`) and then the 30-day warning decide. */
export function lotState(lot: { expiresOn: string | null; retiredAt: Date | string | null }, at: Date): LotState {
  if (lot.retiredAt !== null) return 'retired';
  if (lotExpired(lot.expiresOn, at)) return 'expired';
  if (lot.expiresOn !== null && lotExpired(lot.expiresOn, new Date(at.getTime() + LOT_EXPIRING_DAYS * 86_400_000))) return 'expiring';
  return 'in_date';
}

/** What a booking needs to know about a chosen lot. */
export interface LotForTest {
  lotId: string;
  code: string;
  productId: string;
  formulationId: string;
  expiresOn: string | null;
  retiredAt: Date | null;
}

/**
 * Why a lot cannot go on a test (or into another use, named by `use`) of this product, or null when it
 * can: it must exist, belong to the product, be in use and not be past its last day at the time of use.
 */
export function lotRefusal(lot: LotForTest | undefined, productId: string, at: Date, use = 'for a test'): string | null {
  if (!lot) return 'That lot is not in the catalogue.';
  if (lot.productId !== productId) return `Lot ${lot.code} belongs to another product.`;
  if (lot.retiredAt !== null) return `Lot ${lot.code} has been retired and cannot be used ${use}.`;
  if (lotExpired(lot.expiresOn, at)) return `Lot ${lot.code} expired on ${lot.expiresOn} and cannot be used ${use}.`;
  return null;
}

/**
 * Removers, and products led by a solvent (the first name on a label is the largest part by weight),
 * carry the solvent caution wherever they and their safety data sheet are shown.
 */
export function needsSolventCaution(category: ProductCategory, ingredients: readonly { group: string | null; trivial: boolean }[] | null): boolean {
  if (category === 'remover') return true;
  const lead = (ingredients ?? []).find((i) => !i.trivial);
  return lead?.group === 'solvents';
}

/** The solvent caution, in Plinth's words. */
export const SOLVENT_CAUTION = {
  title: 'Solvents and removers',
  text: 'Work with good ventilation and no open flames nearby, protect your eyes, and read the product’s safety data sheet before use.',
} as const;
