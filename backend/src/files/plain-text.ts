/** A text file is valid UTF-8 with no NUL and no other control characters but tab, CR and LF. */
export function isPlainText(buffer: Uint8Array): boolean {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    return false;
  }
  return !/[\u0000-\u0008\u000B\u000C\u000E-\u001F]/.test(text);
}
