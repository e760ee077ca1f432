/** The password rule, enforced by the server and shown by the app's forms. */
export const MIN_PASSWORD_LENGTH = 12;
/** bcrypt reads only the first 72 bytes of a password, so a longer one is refused rather than silently cut short. */
export const MAX_PASSWORD_BYTES = 72;
