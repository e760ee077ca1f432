import { fileTypeFromBuffer } from 'file-type';
import { isPlainText } from './plain-text';

export { isPlainText } from './plain-text';

/** The largest upload the API takes (attachments and CSV files). */
export const UPLOAD_LIMIT_BYTES = 25 * 1024 * 1024;
export const UPLOAD_LIMIT_TEXT = '25 MB';

/**
 * Multer options for one file in the field "file" beside a few short text fields (a version, a
 * position, a password): every part of a multipart body is bounded, so no body can make the server
 * hold more than one file and a few hundred bytes.
 */
export const UPLOAD_OPTIONS = { limits: { fileSize: UPLOAD_LIMIT_BYTES, files: 1, fields: 4, fieldSize: 1024, fieldNameSize: 64, parts: 5, headerPairs: 20 } };

/** For public uploads (verification): exactly one file, nothing else. */
export const SINGLE_FILE_OPTIONS = {
  limits: { fileSize: UPLOAD_LIMIT_BYTES, files: 1, fields: 0, fieldSize: 0, fieldNameSize: 64, parts: 1, headerPairs: 20 },
};

/** Multer's words for a body outside the limits, as sentences. */
export const MULTIPART_LIMIT_WORDS: Record<string, string> = {
  'File too large': `The file is larger than the ${UPLOAD_LIMIT_TEXT} limit; nothing was stored.`,
  'Too many parts': 'The form has more parts than this upload takes: send the file in the field "file" and only the fields the upload names.',
  'Too many files': 'Send one file, in the field "file".',
  'Too many fields': 'The form has more fields than this upload takes: send the file in the field "file" and only the fields the upload names.',
  'Field name too long': 'A field name in the form is too long.',
  'Field value too long': 'A field in the form is longer than this upload takes (at most 1 kB a field).',
  'Unexpected field': 'Send the file in the field "file".',
};

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

/**
 * The type of an upload judged by its content: the file name's ending must agree with what the bytes
 * are, so a program renamed to .pdf, or a PDF renamed to .png, is refused.
 */
export async function sniffUpload(buffer: Buffer, fileName: string): Promise<SniffResult> {
  const ext = extensionOf(fileName);
  const detected = await fileTypeFromBuffer(buffer);
  if (detected) {
    const kind = Object.entries(ALLOWED).find(([, v]) => v.mediaType === detected.mime || v.extensions.includes(detected.ext));
    if (!kind)
      return {
        ok: false,
        reason: `its content is ${detected.mime}, which is not a kind of file Ampwright keeps (PDF, images, Office documents, ZIP, CSV or text)`,
      };
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
