/** Types of the provisioning helpers the tests call (provision.mjs is plain JavaScript run by node). */
export function ensureNodeModules(): void;
export function ensureDebianPackages(command: string, packages: string[], purpose: string): void;
export function startMariadb(): Promise<void>;
export function ensureDatabase(name: string, options?: { recreate?: boolean }): void;
export function startFakes(options?: { smtpPort?: number; mailApiPort?: number; s3Port?: number; s3Dir?: string }): Promise<unknown>;
export function buildAll(): void;
export function buildCommon(): void;
export function migrateAndSeed(env: Record<string, string>, options?: { seed?: boolean }): void;
export function startApp(env: Record<string, string>): Promise<unknown>;
