// What other features may use of checks: the kept check an application is logged from, and its answers again.
export { answersFor, judge, type PlannedProducts } from './service.ts';
export { approvedFormulations, countWaitingRequests, findCheck, listRequests, listRequestsOfCheck, type CheckRow } from './repo.ts';
