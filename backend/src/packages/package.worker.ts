/**
 * Lays out one package off the main thread (MathJax and pdfkit are CPU-heavy), reporting progress,
 * then signs it here too: opening the firm's PKCS#12 file costs its key iterations, which never run on
 * the server's main thread.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { buildPackagePdf, type PackageInput } from './package-pdf';
import { signPdf } from './signing';
import type { Signing } from './build-in-worker';

const { signing, ...input } = workerData as Omit<PackageInput, 'onProgress'> & { signing?: Signing };
input.attachments = input.attachments.map((a) => ({ ...a, body: Buffer.from(a.body) }));
buildPackagePdf({ ...input, onProgress: (fraction) => parentPort?.postMessage({ progress: fraction }) })
  .then((pdf) => (signing ? signPdf(pdf, Buffer.from(signing.p12), signing.password, signing.who) : pdf))
  .then(
    (pdf) => parentPort?.postMessage({ pdf }),
    (err: Error) => parentPort?.postMessage({ error: err.message }),
  );
