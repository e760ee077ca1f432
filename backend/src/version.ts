// The app's version, from backend/package.json (kept beside the code it describes).
// eslint-disable-next-line @typescript-eslint/no-require-imports
export const APP_VERSION: string = require('../package.json').version;
