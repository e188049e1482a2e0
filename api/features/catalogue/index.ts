// What other features may use of the catalogue: lots and formulations as booking, readings and clearance read them.
export { findLotsForTest, insertLots, type LotForTestRow } from './lot-repo.ts';
export { insertFormulation, insertProduct, loadCurrentFormulations, loadFormulationsWithIngredients, setFirstFormulation } from './repo.ts';
// Product names, categories, material figures and safety sheets, as appliance builds show and check them.
export { findProductSummaries, type ProductSummary } from './repo.ts';
export { insertIngredients } from './ingredient-repo.ts';
export { ingredientValues } from './ingredient-service.ts';
export { writeIngredients } from './service.ts';
// What the clearance loader reads: current formulations (of some or all products) and the vocabulary.
export { currentFormulationIds, currentFormulationsListing, listVocabulary, listVocabularyWithIds, productsWithCurrentFormulation } from './clearance-repo.ts';
