// What other features may use of patch tests on the client.
export { PerformerPatchTests } from './components/performer-patch-tests.tsx';
export { ClearanceSummaryLine } from './components/clearance-summary.tsx';
