/** The auth feature's public face: who is signed in, and the account actions (one file per endpoint in api/). */
export { MIN_PASSWORD_LENGTH } from './api/fields';
export * from './api/auth-keys';
export * from './api/get-me';
export * from './api/sign-in';
export * from './api/register';
export * from './api/confirm-registration';
export * from './api/sign-out';
export * from './api/forgot-password';
export * from './api/reset-password';
export * from './api/get-invitation-preview';
export * from './api/accept-invitation';
export * from './api/update-profile';
export { RequireAuth } from './components/require-auth';
