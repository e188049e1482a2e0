// What other features may use of performers (their records, engagements and identity).
export { performerAccess, productionsWhere } from './access.ts';
export { findConfirmedEmail, lockPerformerByConfirmedEmail } from './identity-repo.ts';
export { linkConfirmedPerformerAtSignIn } from './identity-service.ts';
export { engagedNowCount, findPerformerScope, isEngagedOn, type PerformerScope } from './repo.ts';
export { engagedProductionIds, findPerformer } from './repo.ts';
export { performersEngagedOn, performersMatchingName, withNameSearch } from './repo-search.ts';
export { listEngagementsOf } from './repo.ts';
