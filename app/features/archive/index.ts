// What other features may use of the archive on the client.
export { PerformerCasts } from './components/performer-casts.tsx';
