import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import type { PackageInput } from './package-pdf';

const workerFile = () => {
  const beside = join(__dirname, 'package.worker.js');
  return existsSync(beside) ? beside : join(__dirname, '..', '..', 'dist', 'packages', 'package.worker.js');
};

/** The firm's certificate and what the signature says, for signing in the worker. */
export interface Signing {
  p12: Uint8Array;
  password: string;
  who: { firm: string; reason: string };
}

/**
 * buildPackagePdf in a worker thread, then signPdf there too when `signing` is given, so the server keeps
 * answering while a package is laid out and signed; the worker is stopped at the deadline.
 */
export function buildPackageInWorker(input: PackageInput, signing?: Signing, timeoutMs = 120_000): Promise<Buffer> {
  const { onProgress, ...data } = input;
  return new Promise((resolve, reject) => {
    const worker = new Worker(workerFile(), { workerData: { ...data, signing }, resourceLimits: { maxOldGenerationSizeMb: 1024 } });
    const timer = setTimeout(() => {
      void worker.terminate();
      reject(new Error(`laying out and signing the package took longer than ${timeoutMs / 1000} s`));
    }, timeoutMs);
    worker.on('message', (m: { progress?: number; pdf?: Uint8Array; error?: string }) => {
      if (m.progress !== undefined) onProgress?.(m.progress);
      if (m.pdf) {
        clearTimeout(timer);
        resolve(Buffer.from(m.pdf));
        void worker.terminate();
      }
      if (m.error) {
        clearTimeout(timer);
        reject(new Error(m.error));
        void worker.terminate();
      }
    });
    worker.on('error', (err) => (clearTimeout(timer), reject(err)));
  });
}
