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
