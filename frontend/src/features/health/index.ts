/** The health feature's public face. */
export * from './api/get-health';
