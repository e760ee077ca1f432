import { fileTypeFromBuffer } from 'file-type';

/** The largest upload the API takes (attachments and CSV files). */
export const UPLOAD_LIMIT_BYTES = 25 * 1024 * 1024;
export const UPLOAD_LIMIT_TEXT = '25 MB';

/** Multer options for one file in the field "file". */
export const UPLOAD_OPTIONS = { limits: { fileSize: UPLOAD_LIMIT_BYTES, files: 1 } };

/** What an upload may be, by what its content is: the media type, and the file-name endings that agree with it. */
const ALLOWED: Record<string, { mediaType: string; extensions: string[] }> = {
  pdf: { mediaType: 'application/pdf', extensions: ['pdf'] },
  png: { mediaType: 'image/png', extensions: ['png'] },
  jpg: { mediaType: 'image/jpeg', extensions: ['jpg', 'jpeg'] },
  gif: { mediaType: 'image/gif', extensions: ['gif'] },
  webp: { mediaType: 'image/webp', extensions: ['webp'] },
  tif: { mediaType: 'image/tiff', extensions: ['tif', 'tiff'] },
  svg: { mediaType: 'image/svg+xml', extensions: ['svg'] },
  xlsx: { mediaType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', extensions: ['xlsx'] },
  docx: { mediaType: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document', extensions: ['docx'] },
  zip: { mediaType: 'application/zip', extensions: ['zip'] },
};
const TEXT: Record<string, string> = { csv: 'text/csv', txt: 'text/plain', json: 'application/json', md: 'text/markdown' };

export type SniffResult = { ok: true; mediaType: string } | { ok: false; reason: string };

const extensionOf = (name: string) => /\.([A-Za-z0-9]+)$/.exec(name)?.[1].toLowerCase() ?? '';

/** A text file is valid UTF-8 with no NUL and no other control characters but tab, CR and LF. */
export function isPlainText(buffer: Buffer): boolean {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    return false;
  }
  return !/[\u0000-\u0008\u000B\u000C\u000E-\u001F]/.test(text);
}

/**
 * The type of an upload judged by its content: the file name's ending must agree with what the bytes
 * are, so a program renamed to .pdf, or a PDF renamed to .png, is refused.
 */
export async function sniffUpload(buffer: Buffer, fileName: string): Promise<SniffResult> {
  const ext = extensionOf(fileName);
  const detected = await fileTypeFromBuffer(buffer);
  if (detected) {
    const kind = Object.entries(ALLOWED).find(([, v]) => v.mediaType === detected.mime || v.extensions.includes(detected.ext));
    if (!kind) return { ok: false, reason: `its content is ${detected.mime}, which is not a kind of file Ampwright keeps (PDF, images, Office documents, ZIP, CSV or text)` };
    if (!kind[1].extensions.includes(ext)) return { ok: false, reason: `its name ends in .${ext || '(nothing)'} but its content is ${detected.mime}` };
    return { ok: true, mediaType: kind[1].mediaType };
  }
  if (isPlainText(buffer)) {
    if (ext === 'svg' && /<svg[\s>]/i.test(buffer.subarray(0, 4096).toString('utf8'))) return { ok: true, mediaType: 'image/svg+xml' };
    if (TEXT[ext]) return { ok: true, mediaType: TEXT[ext] };
    return { ok: false, reason: `it is text, but its name ends in .${ext || '(nothing)'}; text is kept as .csv, .txt, .json or .md` };
  }
  return { ok: false, reason: 'its content is not a kind of file Ampwright keeps (PDF, images, Office documents, ZIP, CSV or text)' };
}
