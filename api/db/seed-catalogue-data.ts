import type { ExposureType, ProductCategory } from '#shared/domain/catalogue.ts';
import type { AllergenGroup, Ingredient } from '#shared/domain/ingredients.ts';

/*
 * The demo ingredient vocabulary and product catalogue. Every product, maker and lot is invented.
 *
 * CAS numbers are given only where we are confident of them, all from memory and each passing the CAS
 * check digit; mixtures, polymers and anything uncertain are null rather than guessed.
 *
 * Trivial carriers (they never make two products "share" an allergen): water, glycerin, petrolatum,
 * sodium chloride, silica and talc. Each is nearly everywhere and sensitisation to it is very rare
 * (petrolatum is the vehicle patch-test allergens themselves come in), so counting them would flag almost
 * every pair of products. Propylene glycol, alcohols and fragrance are deliberately not trivial. A declared
 * allergy to a carrier still counts. The head can change any of this.
 */

function ing(inci: string, cas: string | null, group: AllergenGroup, synonyms: string[] = [], trivial = false): Ingredient {
  return { inci, synonyms, cas, group, trivial };
}

export const SEED_INGREDIENTS: Ingredient[] = [
  // carriers
  ing('Aqua', '7732-18-5', 'other', ['Water', 'Eau', 'Purified Water'], true),
  ing('Glycerin', '56-81-5', 'other', ['Glycerol', 'Glycerine'], true),
  ing('Petrolatum', '8009-03-8', 'other', ['Petroleum Jelly', 'White Petrolatum', 'Soft Paraffin'], true),
  ing('Sodium Chloride', '7647-14-5', 'other', ['Salt'], true),
  ing('Silica', '7631-86-9', 'other', ['Silicon Dioxide'], true),
  ing('Talc', '14807-96-6', 'other', [], true),

  // rosin
  ing('Colophonium', '8050-09-7', 'rosin', ['Colophony', 'Rosin', 'Abietic Acid', 'Abietyl Alcohol', 'Gum Rosin', 'Tall Oil', 'Wood Rosin']),
  ing('Glyceryl Rosinate', null, 'rosin', ['Rosin Ester', 'Glycerol Ester of Rosin']),

  // (meth)acrylates
  ing('HEMA', '868-77-9', 'acrylates', ['2-Hydroxyethyl Methacrylate', '2-HEMA', 'Hydroxyethyl Methacrylate']),
  ing('Methyl Methacrylate', '80-62-6', 'acrylates', ['MMA']),
  ing('Ethyl Methacrylate', '97-63-2', 'acrylates', ['EMA']),
  ing('Ethyl Acrylate', '140-88-5', 'acrylates'),
  ing('Butyl Acrylate', '141-32-2', 'acrylates'),
  ing('Ethylhexyl Acrylate', '103-11-7', 'acrylates', ['2-Ethylhexyl Acrylate']),
  ing('Ethyl Cyanoacrylate', '7085-85-0', 'acrylates'),
  ing('Triethylene Glycol Dimethacrylate', '109-16-0', 'acrylates', ['TEGDMA']),
  ing('Acrylates Copolymer', null, 'acrylates'),
  ing('Acrylates/Ethylhexyl Acrylate Copolymer', null, 'acrylates'),

  // natural rubber latex and rubber chemicals
  ing('Natural Rubber Latex', '9006-04-6', 'latex', ['Latex', 'Natural Latex', 'Rubber Latex', 'Hevea Brasiliensis Latex', 'NRL']),
  ing('Ammonia', '7664-41-7', 'other'),
  ing('Tetramethylthiuram Disulfide', '137-26-8', 'rubber_accelerators', ['Thiram', 'TMTD']),
  ing('Tetraethylthiuram Disulfide', '97-77-8', 'rubber_accelerators', ['Disulfiram', 'TETD']),
  ing('Mercaptobenzothiazole', '149-30-4', 'rubber_accelerators', ['MBT', '2-Mercaptobenzothiazole']),
  ing('Zinc Diethyldithiocarbamate', '14324-55-1', 'rubber_accelerators', ['ZDEC']),
  ing('Zinc Dibutyldithiocarbamate', '136-23-2', 'rubber_accelerators', ['ZDBC']),
  ing('Diphenylguanidine', '102-06-7', 'rubber_accelerators', ['DPG', '1,3-Diphenylguanidine']),
  ing('N-Isopropyl-N\u2032-Phenyl-p-Phenylenediamine', '101-72-4', 'rubber_accelerators', ['IPPD']),
  ing('Sulfur', '7704-34-9', 'other', ['Sulphur']),

  // fragrance and the fragrance markers
  ing('Parfum', null, 'fragrance', ['Fragrance', 'Perfume']),
  ing('Limonene', '5989-27-5', 'fragrance', ['d-Limonene']),
  ing('Linalool', '78-70-6', 'fragrance'),
  ing('Citral', '5392-40-5', 'fragrance'),
  ing('Geraniol', '106-24-1', 'fragrance'),
  ing('Citronellol', '106-22-9', 'fragrance'),
  ing('Eugenol', '97-53-0', 'fragrance'),
  ing('Isoeugenol', '97-54-1', 'fragrance'),
  ing('Cinnamyl Alcohol', '104-54-1', 'fragrance'),
  ing('Cinnamal', '104-55-2', 'fragrance', ['Cinnamaldehyde', 'Cinnamic Aldehyde']),
  ing('Amyl Cinnamal', '122-40-7', 'fragrance', ['Amylcinnamaldehyde']),
  ing('Hexyl Cinnamal', '101-86-0', 'fragrance', ['Hexylcinnamaldehyde']),
  ing('Hydroxycitronellal', '107-75-5', 'fragrance'),
  ing('Coumarin', '91-64-5', 'fragrance'),
  ing('Farnesol', '4602-84-0', 'fragrance'),
  ing('Benzyl Alcohol', '100-51-6', 'fragrance'),
  ing('Evernia Prunastri Extract', '90028-68-5', 'fragrance', ['Oakmoss', 'Oak Moss Extract']),
  ing('Myroxylon Pereirae Resin', '8007-00-9', 'fragrance', ['Balsam of Peru', 'Peru Balsam']),
  ing('Citrus Aurantium Dulcis Peel Oil', '8008-57-9', 'fragrance', ['Orange Peel Oil', 'Sweet Orange Oil']),

  // preservatives: isothiazolinones, formaldehyde and its releasers, others
  ing('Methylisothiazolinone', '2682-20-4', 'preservatives', ['MI', 'MIT']),
  ing('Methylchloroisothiazolinone', '26172-55-4', 'preservatives', ['MCI', 'CMIT', 'MCI/MI']),
  ing('Benzisothiazolinone', '2634-33-5', 'preservatives', ['BIT']),
  ing('Octylisothiazolinone', '26530-20-1', 'preservatives', ['OIT']),
  ing('Formaldehyde', '50-00-0', 'preservatives', ['Formalin', 'Methanal']),
  ing('DMDM Hydantoin', '6440-58-0', 'preservatives'),
  ing('Imidazolidinyl Urea', '39236-46-9', 'preservatives'),
  ing('Diazolidinyl Urea', '78491-02-8', 'preservatives'),
  ing('Quaternium-15', '4080-31-3', 'preservatives'),
  ing('2-Bromo-2-Nitropropane-1,3-Diol', '52-51-7', 'preservatives', ['Bronopol']),
  ing('Phenoxyethanol', '122-99-6', 'preservatives'),
  ing('Methylparaben', '99-76-3', 'preservatives'),
  ing('Propylparaben', '94-13-3', 'preservatives'),
  ing('Sodium Benzoate', '532-32-1', 'preservatives'),
  ing('Potassium Sorbate', '24634-61-5', 'preservatives'),

  // solvents
  ing('Isopropyl Alcohol', '67-63-0', 'solvents', ['IPA', 'Isopropanol', '2-Propanol', 'Propan-2-ol']),
  ing('Alcohol', '64-17-5', 'solvents', ['Ethanol', 'Ethyl Alcohol']),
  ing('Alcohol Denat.', null, 'solvents', ['Denatured Alcohol', 'SD Alcohol']),
  ing('Acetone', '67-64-1', 'solvents'),
  ing('Ethyl Acetate', '141-78-6', 'solvents'),
  ing('Isopropyl Myristate', '110-27-0', 'solvents', ['IPM']),
  ing('Isododecane', null, 'solvents'),
  ing('Propylene Glycol', '57-55-6', 'solvents'),
  ing('Butylene Glycol', '107-88-0', 'solvents'),

  // silicones
  ing('Dimethicone', '9006-65-9', 'silicones', ['Polydimethylsiloxane', 'PDMS', 'Silicone Oil']),
  ing('Hexamethyldisiloxane', '107-46-0', 'silicones', ['HMDSO']),
  ing('Cyclopentasiloxane', '541-02-6', 'silicones', ['D5']),
  ing('Cyclohexasiloxane', '540-97-6', 'silicones', ['D6']),
  ing('Trimethylsiloxysilicate', '56275-01-5', 'silicones'),
  ing('Vinyl Dimethicone', '68083-19-2', 'silicones'),

  // epoxy, hair-dye amine, metals
  ing('Bisphenol A Diglycidyl Ether', '1675-54-3', 'other', ['BADGE', 'DGEBA', 'Epoxy Resin']),
  ing('p-Phenylenediamine', '106-50-3', 'pigments', ['PPD', '1,4-Diaminobenzene']),
  ing('Nickel', '7440-02-0', 'other'),
  ing('Nickel Sulfate', '7786-81-4', 'other', ['Nickel Sulphate']),
  ing('Cobalt', '7440-48-4', 'other'),
  ing('Cobalt Chloride', '7646-79-9', 'other'),

  // colourants, listed by CI number
  ing('CI 77491', '1309-37-1', 'pigments', ['Red Iron Oxide']),
  ing('CI 77492', '51274-00-1', 'pigments', ['Yellow Iron Oxide']),
  ing('CI 77499', '1317-61-9', 'pigments', ['Black Iron Oxide']),
  ing('CI 77891', '13463-67-7', 'pigments', ['Titanium Dioxide']),
  ing('CI 77266', '1333-86-4', 'pigments', ['Carbon Black']),
  ing('CI 77007', '57455-37-5', 'pigments', ['Ultramarines']),
  ing('CI 77288', '1308-38-9', 'pigments', ['Chromium Oxide Greens']),
  ing('CI 77947', '1314-13-2', 'pigments', ['Zinc Oxide']),
  ing('Mica', '12001-26-2', 'pigments', ['CI 77019']),

  // other ingredients of the demo products
  ing('Ricinus Communis Seed Oil', '8001-79-4', 'other', ['Castor Oil', 'Ricinus Communis (Castor) Seed Oil']),
  ing('Tocopherol', '10191-41-0', 'other', ['Vitamin E']),
  ing('Caprylic/Capric Triglyceride', null, 'other'),
  ing('Cetearyl Alcohol', '67762-27-0', 'other'),
  ing('Triethyl Citrate', '77-93-0', 'other'),
  ing('Potassium Oleate', '143-18-0', 'other'),
  ing('Zinc Stearate', '557-05-1', 'other'),
  ing('Decyl Glucoside', null, 'other'),
  ing('Rayon', null, 'other', ['Viscose', 'Regenerated Cellulose']),
];

export interface SeedFormulation {
  version: number;
  /** The ingredient list as printed, in label order; null when it was never recorded. */
  inciLabel: string | null;
}

export interface SeedLot {
  code: string;
  /** Last day of use. */
  expiresOn: string;
  formulationVersion: number;
}

export interface SeedProduct {
  key: string;
  name: string;
  maker: string;
  category: ProductCategory;
  exposure: ExposureType;
  /** Oldest first; the highest version is current. */
  formulations: SeedFormulation[];
  lots: SeedLot[];
  /** The maker's figures for a mixed material, from its data sheet (invented here). */
  figures?: { densityGPerCm3: number; mixRatio: { partA: number; partB: number }; makerMaxSoftenerPercent: number };
}

const GULLHAVEN = 'Gullhaven Effects Supply';
const NORTHWICK = 'Northwick Studio Materials';
const PEBBLECOMBE = 'Pebblecombe Laboratories';
const MARROWBY = 'Marrowby Workshop Goods';

function one(inciLabel: string | null): SeedFormulation[] {
  return [{ version: 1, inciLabel }];
}

export const SEED_PRODUCTS: SeedProduct[] = [
  {
    key: 'harbour-bond',
    name: 'Harbour Bond silicone adhesive',
    maker: GULLHAVEN,
    category: 'adhesive',
    exposure: 'leave_on',
    formulations: [
      { version: 1, inciLabel: 'Ingredients: Cyclopentasiloxane, Trimethylsiloxysilicate, Dimethicone.' },
      { version: 2, inciLabel: 'Ingredients: Hexamethyldisiloxane, Trimethylsiloxysilicate, Dimethicone, Vinyl Dimethicone.' },
    ],
    lots: [
      { code: 'HB-2411', expiresOn: '2026-10-31', formulationVersion: 1 },
      { code: 'HB-2603', expiresOn: '2027-09-30', formulationVersion: 2 },
      { code: 'HB-2607', expiresOn: '2028-03-31', formulationVersion: 2 },
    ],
  },
  {
    key: 'quayside',
    name: 'Quayside acrylic emulsion adhesive',
    maker: NORTHWICK,
    category: 'adhesive',
    exposure: 'leave_on',
    formulations: one('Ingredients: Aqua, Acrylates Copolymer, Propylene Glycol, Glycerin, Phenoxyethanol, Methylisothiazolinone.'),
    lots: [
      { code: 'QA-2602', expiresOn: '2027-06-30', formulationVersion: 1 },
      { code: 'QA-2609', expiresOn: '2028-02-29', formulationVersion: 1 },
    ],
  },
  {
    key: 'breakwater',
    name: 'Breakwater acrylic sealer',
    maker: NORTHWICK,
    category: 'sealer',
    exposure: 'leave_on',
    formulations: one('Ingredients: Alcohol Denat., Acrylates Copolymer, Aqua, Glycerin.'),
    lots: [{ code: 'BW-2601', expiresOn: '2027-04-30', formulationVersion: 1 }],
  },
  {
    key: 'shingle',
    name: 'Shingle resin adhesive',
    maker: MARROWBY,
    category: 'adhesive',
    exposure: 'leave_on',
    formulations: one('Ingredients: Alcohol Denat., Colophonium, Ricinus Communis (Castor) Seed Oil.'),
    lots: [{ code: 'SR-2605', expiresOn: '2028-01-31', formulationVersion: 1 }],
  },
  {
    key: 'tidewater',
    name: 'Tidewater citrus remover',
    maker: PEBBLECOMBE,
    category: 'remover',
    exposure: 'rinse_off',
    formulations: one('Ingredients: Isopropyl Myristate, Citrus Aurantium Dulcis (Orange) Peel Oil, Limonene*, Tocopherol, Linalool*, Citral*. *Fragrance allergen'),
    lots: [{ code: 'TW-2604', expiresOn: '2027-12-31', formulationVersion: 1 }],
  },
  {
    key: 'saltmarsh',
    name: 'Saltmarsh isopropyl myristate remover',
    maker: PEBBLECOMBE,
    category: 'remover',
    exposure: 'rinse_off',
    formulations: one('Ingredients: Isopropyl Myristate, Caprylic/Capric Triglyceride, Parfum, Limonene.'),
    lots: [{ code: 'SM-2606', expiresOn: '2028-05-31', formulationVersion: 1 }],
  },
  {
    key: 'pier',
    name: 'Pier silicone adhesive remover',
    maker: GULLHAVEN,
    category: 'remover',
    exposure: 'rinse_off',
    formulations: one('Ingredients: Hexamethyldisiloxane, Isopropyl Alcohol.'),
    lots: [{ code: 'PR-2602', expiresOn: '2027-08-31', formulationVersion: 1 }],
  },
  {
    key: 'estuary',
    name: 'Estuary liquid latex',
    maker: MARROWBY,
    category: 'other',
    exposure: 'leave_on',
    formulations: one('Ingredients: Natural Rubber Latex, Aqua, Ammonia.'),
    lots: [{ code: 'EL-2603', expiresOn: '2027-03-31', formulationVersion: 1 }],
  },
  {
    key: 'foghorn',
    name: 'Foghorn foam latex system',
    maker: MARROWBY,
    category: 'foam_latex',
    exposure: 'leave_on',
    formulations: one(
      'Ingredients: Natural Rubber Latex, Aqua, Potassium Oleate, Sulfur, Zinc Oxide, Zinc Diethyldithiocarbamate, Mercaptobenzothiazole, Ammonia.',
    ),
    lots: [{ code: 'FF-2605', expiresOn: '2027-11-30', formulationVersion: 1 }],
  },
  {
    key: 'lighthouse',
    name: 'Lighthouse vinyl cap plastic',
    maker: NORTHWICK,
    category: 'cap_material',
    exposure: 'leave_on',
    formulations: one('Ingredients: Acetone, Vinyl Chloride/Vinyl Acetate Copolymer, Triethyl Citrate.'),
    lots: [{ code: 'LC-2604', expiresOn: '2028-04-30', formulationVersion: 1 }],
  },
  {
    key: 'dune',
    name: 'Dune barrier cream',
    maker: PEBBLECOMBE,
    category: 'barrier',
    exposure: 'leave_on',
    formulations: one('Ingredients: Aqua, Petrolatum, Dimethicone, Glycerin, Cetearyl Alcohol, Phenoxyethanol.'),
    lots: [{ code: 'DB-2602', expiresOn: '2027-07-31', formulationVersion: 1 }],
  },
  {
    key: 'pebble',
    name: 'Pebble alcohol-activated palette',
    maker: GULLHAVEN,
    category: 'paint',
    exposure: 'leave_on',
    formulations: one('Ingredients: Acrylates Copolymer, Ricinus Communis Seed Oil, Silica. May contain (+/-): CI 77491, CI 77492, CI 77499, CI 77891, CI 77266.'),
    lots: [{ code: 'PP-2605', expiresOn: '2028-06-30', formulationVersion: 1 }],
  },
  {
    key: 'gull-grey',
    name: 'Gull grey pigment powder',
    maker: GULLHAVEN,
    category: 'pigment',
    exposure: 'leave_on',
    formulations: one('Ingredients: Mica, Talc, CI 77499, CI 77891, CI 77007.'),
    lots: [{ code: 'GG-2601', expiresOn: '2028-01-31', formulationVersion: 1 }],
  },
  {
    key: 'slipway',
    name: 'Slipway platinum silicone base',
    maker: NORTHWICK,
    category: 'silicone',
    exposure: 'leave_on',
    formulations: one('Ingredients: Vinyl Dimethicone, Silica, Dimethicone.'),
    lots: [
      { code: 'SP-2606', expiresOn: '2027-10-31', formulationVersion: 1 },
      { code: 'SP-2611', expiresOn: '2028-04-30', formulationVersion: 1 },
    ],
    figures: { densityGPerCm3: 1.08, mixRatio: { partA: 1, partB: 1 }, makerMaxSoftenerPercent: 100 },
  },
  {
    key: 'tern',
    name: 'Tern gentle skin cleanser',
    maker: PEBBLECOMBE,
    category: 'cleanser',
    exposure: 'rinse_off',
    formulations: one('Ingredients: Aqua, Glycerin, Decyl Glucoside, Sodium Chloride, Sodium Benzoate, Potassium Sorbate.'),
    lots: [{ code: 'TC-2603', expiresOn: '2027-09-30', formulationVersion: 1 }],
  },
  {
    key: 'mistral',
    name: 'Mistral setting powder',
    maker: MARROWBY,
    category: 'powder',
    exposure: 'leave_on',
    formulations: one('Ingredients: Talc, Silica, Zinc Stearate, Parfum.'),
    lots: [{ code: 'MS-2604', expiresOn: '2028-02-29', formulationVersion: 1 }],
  },
  // The appliance workshop: what goes into a run of silicone pieces besides the silicone itself.
  {
    key: 'slack-tide',
    name: 'Slack Tide silicone softener',
    maker: NORTHWICK,
    category: 'silicone',
    exposure: 'leave_on',
    formulations: one('Ingredients: Dimethicone.'),
    lots: [{ code: 'ST-2605', expiresOn: '2028-01-31', formulationVersion: 1 }],
  },
  {
    key: 'kelpwrack',
    name: 'Kelpwrack flesh-red silicone pigment',
    maker: GULLHAVEN,
    category: 'pigment',
    exposure: 'leave_on',
    formulations: one('Ingredients: Dimethicone, CI 77491, CI 77891.'),
    lots: [{ code: 'KW-2604', expiresOn: '2028-03-31', formulationVersion: 1 }],
  },
  {
    key: 'sea-fret',
    name: 'Sea-fret rayon flocking',
    maker: MARROWBY,
    category: 'other',
    exposure: 'leave_on',
    formulations: one('Ingredients: Rayon, CI 77491.'),
    lots: [{ code: 'SF-2602', expiresOn: '2028-02-29', formulationVersion: 1 }],
  },
  {
    key: 'mooring',
    name: 'Mooring acetone',
    maker: MARROWBY,
    category: 'other',
    exposure: 'rinse_off',
    formulations: one('Ingredients: Acetone.'),
    lots: [{ code: 'MA-2603', expiresOn: '2027-12-31', formulationVersion: 1 }],
  },
  {
    key: 'wharfside',
    name: 'Wharfside mold release',
    maker: GULLHAVEN,
    category: 'other',
    exposure: 'rinse_off',
    formulations: one('Ingredients: Petrolatum, Dimethicone, Isopropyl Alcohol.'),
    lots: [{ code: 'WR-2602', expiresOn: '2027-11-30', formulationVersion: 1 }],
  },
  {
    key: 'flotsam',
    name: 'Flotsam prosthetic adhesive',
    maker: MARROWBY,
    category: 'adhesive',
    exposure: 'leave_on',
    formulations: one(null),
    lots: [{ code: 'FA-2602', expiresOn: '2027-05-31', formulationVersion: 1 }],
  },
];
