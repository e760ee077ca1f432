/** Lays out one package off the main thread (MathJax and pdfkit are CPU-heavy), reporting progress. */
import { parentPort, workerData } from 'node:worker_threads';
import { buildPackagePdf, type PackageInput } from './package-pdf';

const input = workerData as Omit<PackageInput, 'onProgress'>;
input.attachments = input.attachments.map((a) => ({ ...a, body: Buffer.from(a.body) }));
buildPackagePdf({ ...input, onProgress: (fraction) => parentPort?.postMessage({ progress: fraction }) }).then(
  (pdf) => parentPort?.postMessage({ pdf }),
  (err: Error) => parentPort?.postMessage({ error: err.message }),
);
