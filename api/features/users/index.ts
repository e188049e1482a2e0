// What other features may use of users.
export { userSummaryJsonSql, usersWithoutAccessCount, findUserSummary, findUserWithProductionNames, isStaffAddress, staffAddressesAmong } from './repo.ts';
export { findUserById } from './repo.ts';
