/** The packages feature's public face: signed packages, the portal, verification, the firm's certificate. */
export * from './api/packages';
export { CertificatePanel } from './components/certificate-panel';
export { PackageLink } from './components/package-link';
