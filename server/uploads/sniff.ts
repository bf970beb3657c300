/**
 * The type of an uploaded file, decided from its content (the name only chooses
 * between text formats that look alike). Returns null for anything not allowed.
 */
export type AllowedType = 'application/pdf' | 'image/png' | 'image/svg+xml' | 'text/csv' | 'application/x-tex';

/** Control characters other than tab, newline and carriage return mean binary data. */
const isBinaryByte = (b: number) => b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d;

/** The bytes as UTF-8 text (a worksheet import, a CSV or TeX attachment), or null for binary data. */
export function decodeUtf8(bytes: Uint8Array): string | null {
  if (bytes.some(isBinaryByte)) return null;
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return null;
  }
}

const startsWith = (bytes: Uint8Array, magic: number[]) => magic.every((b, i) => bytes[i] === b);

export function sniffType(bytes: Uint8Array, fileName: string): AllowedType | null {
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) return 'application/pdf'; // %PDF-
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
  const text = decodeUtf8(bytes);
  if (text === null) return null;
  const head = text.slice(0, 2048).replace(/^\uFEFF/, '').trimStart();
  if (/^(<\?xml[^>]*>\s*)?(<!--[\s\S]*?-->\s*)*(<!DOCTYPE svg[^>]*>\s*)?<svg[\s>]/i.test(head)) return 'image/svg+xml';
  const ext = fileName.toLowerCase().split('.').pop();
  if (ext === 'tex' && /\\[a-zA-Z]+/.test(text)) return 'application/x-tex';
  if (ext === 'csv' && /^[^\n]*[,;\t][^\n]*(\n|$)/.test(text)) return 'text/csv';
  return null;
}
