import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import type { PackageInput } from './package-pdf';

const workerFile = () => {
  const beside = join(__dirname, 'package.worker.js');
  return existsSync(beside) ? beside : join(__dirname, '..', '..', 'dist', 'packages', 'package.worker.js');
};

/** buildPackagePdf in a worker thread, so the server keeps answering while a package is laid out. */
export function buildPackageInWorker(input: PackageInput, timeoutMs = 120_000): Promise<Buffer> {
  const { onProgress, ...data } = input;
  return new Promise((resolve, reject) => {
    const worker = new Worker(workerFile(), { workerData: data, resourceLimits: { maxOldGenerationSizeMb: 1024 } });
    const timer = setTimeout(() => {
      void worker.terminate();
      reject(new Error(`laying out the package took longer than ${timeoutMs / 1000} s`));
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
