// What other features may use of kits.
export { existingProductIds } from './repo.ts';
