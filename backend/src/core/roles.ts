/** The roles of PRODUCT.md. A member may hold several; a client holds only `client`. */
export const ROLES = ['owner', 'engineer', 'checker', 'approver', 'client'] as const;
export type Role = (typeof ROLES)[number];
export const MEMBER_ROLES: Role[] = ['owner', 'engineer', 'checker', 'approver'];
/** Who may write sheets: create them, edit cells, upload attachments. */
export const SHEET_EDITORS: Role[] = ['owner', 'engineer'];
