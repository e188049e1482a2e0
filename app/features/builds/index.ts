// What other features may use of appliance builds on the client.
export { PerformerBuilds } from './components/performer-builds.tsx';
