/** The members feature's public face: the firm's people and invitations. */
export * from './api/members';
