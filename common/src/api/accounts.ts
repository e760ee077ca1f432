/** The password rule, enforced by the server and shown by the app's forms. */
export const MIN_PASSWORD_LENGTH = 12;
