// What other features may use of consents; everything else here is the feature's own.
export { bringsGateConsents, consentFromJson, consentsJsonSql, gateConsentsJsonSql, gateConsentsOfRows, type GateConsentJson, consentCoversSql, consentStateSql, countActiveConsents, expiringForProductionCount, listConsentSummaries, listConsentsForGate, storageConsentTimes } from './consent-repo.ts';
export { listOpenRequestsForPerformer, openLinkRequestsCount } from './request-repo.ts';
export { writeSignedConsent } from './signing-service.ts';
export { findCurrentTemplateVersion } from './template-repo.ts';
export { findConsentDetailRow, listConsentAnswers } from './consent-repo.ts';
// The clearance loader reads declared allergies from the performer's own answers.
export { listDeclaredAllergyAnswers } from './allergy-repo.ts';
// The home's counts, each a one-column query its counts statement selects.
export { newWithdrawalsCount } from './notice-service.ts';
