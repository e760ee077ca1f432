/** The members feature's public face: the firm's people and invitations. */
export * from './api/types';
export * from './api/member-keys';
export * from './api/get-members';
export * from './api/get-invitations';
export * from './api/invite-member';
export * from './api/revoke-invitation';
export * from './api/update-roles';
export * from './api/remove-member';
