// The catalogue (ingredients, products, formulations, lots) and test protocols: database types kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;

export type AllergenGroupCol = 'acrylates' | 'rosin' | 'latex' | 'rubber_accelerators' | 'fragrance' | 'preservatives' | 'solvents' | 'silicones' | 'pigments' | 'other';
export type ProductCategoryCol = 'adhesive' | 'remover' | 'sealer' | 'barrier' | 'paint' | 'pigment' | 'silicone' | 'foam_latex' | 'cap_material' | 'cleanser' | 'powder' | 'other';
export type TestKindCol = 'department_use' | 'repeated_open' | 'occluded_patch' | 'short_contact';

export interface IngredientsTable {
  id: Generated<string>;
  inci: string;
  /** normaliseInciName(inci). */
  inci_key: string;
  synonyms: ColumnType<string[], string[] | undefined, string[]>;
  /** The normalised INCI name and synonyms; no key belongs to two ingredients. */
  name_keys: string[];
  cas: string | null;
  allergen_group: AllergenGroupCol;
  trivial: Generated<boolean>;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProductsTable {
  id: Generated<string>;
  name: string;
  maker: string | null;
  category: ProductCategoryCol;
  exposure: 'leave_on' | 'rinse_off';
  density_g_per_cm3: number | null;
  mix_ratio_a: number | null;
  mix_ratio_b: number | null;
  max_softener_percent: number | null;
  /** Null only inside the transaction that creates the product. */
  current_formulation_id: string | null;
  sds_file_id: string | null;
  sds_file_name: string | null;
  sds_uploaded_at: Date | null;
  sds_uploaded_by: string | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProductFormulationsTable {
  id: Generated<string>;
  product_id: string;
  version: number;
  /** The list as pasted; null while the ingredients are not recorded. */
  inci_label: string | null;
  note: string | null;
  created_by: string | null;
  created_at: Timestamp;
}

export interface FormulationIngredientsTable {
  formulation_id: string;
  /** 0-based, in label order. */
  position: number;
  label_name: string;
  /** Null while the vocabulary lacks the name. */
  ingredient_id: string | null;
  may_contain: Generated<boolean>;
}

export interface ProductLotsTable {
  id: Generated<string>;
  product_id: string;
  formulation_id: string;
  code: string;
  /** Last day of use (YYYY-MM-DD). */
  expires_on: ColumnType<string, string, string>;
  retired_at: Date | null;
  retired_by: string | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProtocolsTable {
  /** The protocol's slug, e.g. "occluded-48h". */
  id: string;
  current_version: Generated<number>;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface ProtocolVersionsTable {
  /** What a booked test stores, so it keeps the protocol it was booked with. */
  id: Generated<string>;
  protocol_id: string;
  version: number;
  name: string;
  kind: TestKindCol;
  description: string;
  occlusion_minutes: number | null;
  applications: ColumnType<unknown, string, string>;
  readings: ColumnType<unknown, string, string>;
  created_by: string | null;
  created_at: Timestamp;
}
