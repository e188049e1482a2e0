// What other features may use of the check and the application log on the client.
export { PerformerCard } from './components/performer-card.tsx';
export { ArtistHome, LeadHome, useHomePanelEntries } from './components/homes.tsx';
