export { findLastSeat } from './repo.ts';
