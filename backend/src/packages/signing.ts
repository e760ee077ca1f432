/**
 * The firm's signing certificate and the signature of a package: a detached PKCS#7 signature
 * (adbe.pkcs7.detached) added with @signpdf, which PDF readers and poppler's pdfsig check.
 */
import { createCipheriv, createDecipheriv, generateKeyPairSync, randomBytes, scryptSync } from 'node:crypto';
import forge from 'node-forge';
import { plainAddPlaceholder } from '@signpdf/placeholder-plain';
import { P12Signer } from '@signpdf/signer-p12';
import signpdf from '@signpdf/signpdf';

export interface CertificateFacts {
  subject: string;
  issuer: string;
  notBefore: Date;
  notAfter: Date;
  fingerprint: string;
}

export class CertificateProblem extends Error {}

const name = (attrs: forge.pki.CertificateField[]) => attrs.map((a) => `${a.shortName ?? a.name}=${String(a.value)}`).join(', ');

/** Opens a PKCS#12 file with its password and checks it holds a key and a certificate valid now. */
export function readP12(p12: Buffer, password: string, now = new Date()): CertificateFacts {
  let parsed: forge.pkcs12.Pkcs12Pfx;
  try {
    parsed = forge.pkcs12.pkcs12FromAsn1(forge.asn1.fromDer(forge.util.createBuffer(p12.toString('binary'))), password);
  } catch (err) {
    const m = (err as Error).message;
    if (/MAC could not be verified|Invalid password/i.test(m)) throw new CertificateProblem('The password does not open this certificate file.');
    throw new CertificateProblem('This is not a PKCS#12 (.p12 or .pfx) certificate file.');
  }
  const keys = [...(parsed.getBags({ bagType: forge.pki.oids.pkcs8ShroudedKeyBag })[forge.pki.oids.pkcs8ShroudedKeyBag] ?? []), ...(parsed.getBags({ bagType: forge.pki.oids.keyBag })[forge.pki.oids.keyBag] ?? [])];
  const certs = parsed.getBags({ bagType: forge.pki.oids.certBag })[forge.pki.oids.certBag] ?? [];
  const cert = certs[0]?.cert;
  if (!keys.length || !cert) throw new CertificateProblem('The file must hold a private key and its certificate.');
  if (cert.validity.notAfter < now) throw new CertificateProblem(`The certificate expired on ${cert.validity.notAfter.toISOString().slice(0, 10)}.`);
  if (cert.validity.notBefore > now) throw new CertificateProblem(`The certificate is not valid before ${cert.validity.notBefore.toISOString().slice(0, 10)}.`);
  const der = forge.asn1.toDer(forge.pki.certificateToAsn1(cert)).getBytes();
  return { subject: name(cert.subject.attributes), issuer: name(cert.issuer.attributes), notBefore: cert.validity.notBefore, notAfter: cert.validity.notAfter, fingerprint: forge.md.sha256.create().update(der).digest().toHex() };
}

/** A self-signed certificate for the firm (for the demo and until the owner uploads the firm's own). */
export function makeSelfSignedP12(firm: string, password: string, years = 3, notBefore = new Date()): Buffer {
  const { privateKey, publicKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });
  const key = forge.pki.privateKeyFromPem(privateKey.export({ type: 'pkcs1', format: 'pem' }).toString());
  const cert = forge.pki.createCertificate();
  cert.publicKey = forge.pki.publicKeyFromPem(publicKey.export({ type: 'spki', format: 'pem' }).toString());
  cert.serialNumber = `01${randomBytes(8).toString('hex')}`;
  cert.validity.notBefore = notBefore;
  cert.validity.notAfter = new Date(notBefore.getTime() + years * 365.25 * 86400_000);
  const attrs = [{ name: 'commonName', value: `${firm} (self-signed, Ampwright)` }, { name: 'organizationName', value: firm }];
  cert.setSubject(attrs);
  cert.setIssuer(attrs);
  cert.setExtensions([{ name: 'basicConstraints', cA: false }, { name: 'keyUsage', digitalSignature: true, nonRepudiation: true }]);
  cert.sign(key, forge.md.sha256.create());
  const asn1 = forge.pkcs12.toPkcs12Asn1(key, [cert], password, { algorithm: '3des' });
  return Buffer.from(forge.asn1.toDer(asn1).getBytes(), 'binary');
}

/** Signs a finished PDF: adds the signature field, then fills it with the detached PKCS#7 signature. */
export async function signPdf(pdf: Buffer, p12: Buffer, password: string, who: { firm: string; reason: string }, signingTime = new Date()): Promise<Buffer> {
  const withPlaceholder = plainAddPlaceholder({ pdfBuffer: pdf, reason: who.reason, contactInfo: who.firm, name: who.firm, location: 'Ampwright', signingTime, signatureLength: 16384 });
  return signpdf.sign(withPlaceholder, new P12Signer(p12, { passphrase: password }), signingTime);
}

/** AES-256-GCM with a key derived from the app's secret: how the certificate password is kept at rest. */
export function sealSecret(plain: string, secret: string): string {
  const iv = randomBytes(12);
  const c = createCipheriv('aes-256-gcm', scryptSync(secret, 'ampwright-certificate', 32), iv);
  const body = Buffer.concat([c.update(plain, 'utf8'), c.final()]);
  return [iv, c.getAuthTag(), body].map((b) => b.toString('base64')).join('.');
}

export function openSecret(sealed: string, secret: string): string {
  const [iv, tag, body] = sealed.split('.').map((p) => Buffer.from(p, 'base64'));
  const d = createDecipheriv('aes-256-gcm', scryptSync(secret, 'ampwright-certificate', 32), iv);
  d.setAuthTag(tag);
  return Buffer.concat([d.update(body), d.final()]).toString('utf8');
}
