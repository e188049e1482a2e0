// What other features may use of users.
export { countUsersWithoutAccess, findUserSummary, isStaffAddress, staffAddressesAmong } from './repo.ts';
