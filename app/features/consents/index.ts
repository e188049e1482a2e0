// What other features may use of the consents feature on the client.
export { handOver, signingRequestsQueryOptions, useCancelSigningRequest, useCreateSigningRequest } from './api.ts';
export { handOverBundle, useCreateSigningBundle } from './api.ts';
export { HealthSummarySection } from './components/health-answers.tsx';
export { ConsentWorkPanels } from './components/withdrawal-notices.tsx';
export { SendFormNow } from './components/send-form-now.tsx';
