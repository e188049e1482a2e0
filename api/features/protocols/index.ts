// What other features may use of the test protocols: the version a test is booked on, read back by its id.
export { findCurrentProtocolVersion, findProtocolVersions, protocolOfRow } from './repo.ts';
export { ensureDefaultProtocols } from './service.ts';
