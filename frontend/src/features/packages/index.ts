/** The packages feature's public face: signed packages, the portal, verification, the firm's certificate. */
export * from './api/package-keys';
export * from './api/get-package-status';
export * from './api/retry-package';
export * from './api/get-portal';
export * from './api/verify-package';
export * from './api/get-certificate';
export * from './api/upload-certificate';
export * from './api/get-package-settings';
export * from './api/set-package-settings';
export { CertificatePanel } from './components/certificate-panel';
export { PackageLink } from './components/package-link';
