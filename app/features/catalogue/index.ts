// What other features may use of the catalogue on the client: the product list and one product's record.
export { productQueryOptions, productsQueryOptions } from './api.ts';
