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

/**
 * The most key-derivation or MAC iterations a PKCS#12 file may ask for. Files made by OpenSSL 3 use
 * 2 048, Windows 2 000, Java's keytool 10 000 (from memory); 100 000 leaves room for stricter settings
 * while keeping one decryption under about a second in node-forge. A file asking for more is refused
 * before anything is decrypted: node-forge runs the iterations before it checks the password.
 */
export const MAX_P12_ITERATIONS = 100_000;
const MAX_NODES = 20_000;
const MAX_DEPTH = 64;

/**
 * Walks a PKCS#12 file's DER, including the DER held inside OCTET STRINGs (the authenticated safe, its
 * safe contents and bags), and checks every iteration count: in PKCS#12's MacData, in PKCS#5 PBE and
 * PBKDF2 parameters alike, the count is an INTEGER that follows the salt's OCTET STRING (RFC 7292
 * appendix A and RFC 8018 appendix A.2).
 */
export function assertSaneIterations(der: Buffer): void {
  let nodes = 0;
  const walk = (node: forge.asn1.Asn1, depth: number): void => {
    if (++nodes > MAX_NODES || depth > MAX_DEPTH) throw new CertificateProblem('This certificate file is nested more deeply than a PKCS#12 file is.');
    if (Array.isArray(node.value)) {
      const parts = node.value;
      parts.forEach((part, k) => {
        const before = parts[k - 1];
        if (
          part.tagClass === forge.asn1.Class.UNIVERSAL &&
          part.type === forge.asn1.Type.INTEGER &&
          before?.tagClass === forge.asn1.Class.UNIVERSAL &&
          before.type === forge.asn1.Type.OCTETSTRING &&
          typeof part.value === 'string'
        ) {
          const bytes = part.value;
          const count = bytes.length > 6 ? Infinity : [...bytes].reduce((n, ch) => n * 256 + ch.charCodeAt(0), 0);
          if (count > MAX_P12_ITERATIONS) {
            throw new CertificateProblem(
              `This certificate file asks for ${Number.isFinite(count) ? count.toLocaleString('en') : 'an enormous number of'} key iterations; Ampwright takes at most ${MAX_P12_ITERATIONS.toLocaleString('en')}. Export it again with the usual settings.`,
            );
          }
        }
        walk(part, depth + 1);
      });
      return;
    }
    if (node.type === forge.asn1.Type.OCTETSTRING && typeof node.value === 'string' && node.value.charCodeAt(0) === 0x30) {
      let inner: forge.asn1.Asn1 | undefined;
      try {
        inner = forge.asn1.fromDer(node.value, { strict: true, parseAllBytes: true, decodeBitStrings: false } as never);
      } catch {
        return; // not DER: encrypted or plain bytes
      }
      walk(inner, depth + 1);
    }
  };
  let root: forge.asn1.Asn1;
  try {
    root = forge.asn1.fromDer(forge.util.createBuffer(der.toString('binary')), { strict: true, decodeBitStrings: false } as never);
  } catch {
    throw new CertificateProblem('This is not a PKCS#12 (.p12 or .pfx) certificate file.');
  }
  walk(root, 0);
}

/** Opens a PKCS#12 file with its password and checks it holds a key and a certificate valid now. */
export function readP12(p12: Buffer, password: string, now = new Date()): CertificateFacts {
  assertSaneIterations(p12);
  let parsed: forge.pkcs12.Pkcs12Pfx;
  try {
    parsed = forge.pkcs12.pkcs12FromAsn1(forge.asn1.fromDer(forge.util.createBuffer(p12.toString('binary'))), password);
  } catch (err) {
    const m = (err as Error).message;
    if (/MAC could not be verified|Invalid password/i.test(m)) throw new CertificateProblem('The password does not open this certificate file.');
    throw new CertificateProblem('This is not a PKCS#12 (.p12 or .pfx) certificate file.');
  }
  const keys = [
    ...(parsed.getBags({ bagType: forge.pki.oids.pkcs8ShroudedKeyBag })[forge.pki.oids.pkcs8ShroudedKeyBag] ?? []),
    ...(parsed.getBags({ bagType: forge.pki.oids.keyBag })[forge.pki.oids.keyBag] ?? []),
  ];
  const certs = parsed.getBags({ bagType: forge.pki.oids.certBag })[forge.pki.oids.certBag] ?? [];
  const cert = certs[0]?.cert;
  if (!keys.length || !cert) throw new CertificateProblem('The file must hold a private key and its certificate.');
  if (cert.validity.notAfter < now) throw new CertificateProblem(`The certificate expired on ${cert.validity.notAfter.toISOString().slice(0, 10)}.`);
  if (cert.validity.notBefore > now) throw new CertificateProblem(`The certificate is not valid before ${cert.validity.notBefore.toISOString().slice(0, 10)}.`);
  const der = forge.asn1.toDer(forge.pki.certificateToAsn1(cert)).getBytes();
  return {
    subject: name(cert.subject.attributes),
    issuer: name(cert.issuer.attributes),
    notBefore: cert.validity.notBefore,
    notAfter: cert.validity.notAfter,
    fingerprint: forge.md.sha256.create().update(der).digest().toHex(),
  };
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
  const attrs = [
    { name: 'commonName', value: `${firm} (self-signed, Ampwright)` },
    { name: 'organizationName', value: firm },
  ];
  cert.setSubject(attrs);
  cert.setIssuer(attrs);
  cert.setExtensions([
    { name: 'basicConstraints', cA: false },
    { name: 'keyUsage', digitalSignature: true, nonRepudiation: true },
  ]);
  cert.sign(key, forge.md.sha256.create());
  const asn1 = forge.pkcs12.toPkcs12Asn1(key, [cert], password, { algorithm: '3des' });
  return Buffer.from(forge.asn1.toDer(asn1).getBytes(), 'binary');
}

/** Signs a finished PDF: adds the signature field, then fills it with the detached PKCS#7 signature. */
export async function signPdf(pdf: Buffer, p12: Buffer, password: string, who: { firm: string; reason: string }, signingTime = new Date()): Promise<Buffer> {
  assertSaneIterations(p12);
  const withPlaceholder = plainAddPlaceholder({
    pdfBuffer: pdf,
    reason: who.reason,
    contactInfo: who.firm,
    name: who.firm,
    location: 'Ampwright',
    signingTime,
    signatureLength: 16384,
  });
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
