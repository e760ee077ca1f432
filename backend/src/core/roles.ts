/** The roles of PRODUCT.md, from the workflow rulebook in common (one list for the server and the app). */
export { ROLES, MEMBER_ROLES, SHEET_EDITORS, type Role } from '@ampwright/common';
