/** The auth feature's public face: who is signed in, and the account actions. */
export * from './api/auth-mutations';
export * from './api/get-me';
export { RequireAuth } from './components/require-auth';
