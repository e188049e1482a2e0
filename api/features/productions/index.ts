// What other features may use of productions, memberships and lead appointments.
export { addPerformerMemberships, findCurrentLeads, findHeads, productionsWithoutLeadCount, findProductionName, productionNames, removePerformerMemberships } from './repo.ts';
export { findProduction, productionIdsMatchingName, staffOf } from './repo.ts';
export { type Department, departmentInWords, departmentLine, findDepartment, findDepartments, mailFooter } from './department.ts';
