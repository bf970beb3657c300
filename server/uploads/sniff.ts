import { open } from 'node:fs/promises';

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

/** How much of a file decides its type (an SVG's opening tag may follow a prolog and comments). */
const HEAD_BYTES = 8192;

/**
 * The type of a file on disk, read a piece at a time: the head decides the candidate
 * type, and a text type (SVG, CSV, TeX) holds only when the whole file is UTF-8 text
 * without control characters, checked as it streams past. Never holds the whole file.
 */
export async function sniffFile(path: string, fileName: string): Promise<AllowedType | null> {
  const file = await open(path, 'r');
  try {
    const head = Buffer.alloc(HEAD_BYTES);
    const { bytesRead } = await file.read(head, 0, HEAD_BYTES, 0);
    const start = head.subarray(0, bytesRead);
    if (startsWith(start, [0x25, 0x50, 0x44, 0x46, 0x2d])) return 'application/pdf';
    if (startsWith(start, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
    // The head may end inside a UTF-8 sequence: decode it leniently for the guess only.
    const guess = sniffType(trimPartialUtf8(start), fileName);
    if (guess === null) return null;
    const decoder = new TextDecoder('utf-8', { fatal: true });
    const chunk = Buffer.alloc(64 * 1024);
    let position = 0;
    for (;;) {
      const { bytesRead: n } = await file.read(chunk, 0, chunk.length, position);
      if (n === 0) break;
      const piece = chunk.subarray(0, n);
      if (piece.some(isBinaryByte)) return null;
      try {
        decoder.decode(piece, { stream: true });
      } catch {
        return null;
      }
      position += n;
    }
    try {
      decoder.decode();
    } catch {
      return null;
    }
    return guess;
  } finally {
    await file.close();
  }
}

/** The bytes without a UTF-8 sequence cut off at the end. */
function trimPartialUtf8(bytes: Uint8Array): Uint8Array {
  let end = bytes.length;
  // Step back over continuation bytes (10xxxxxx) to the lead byte of the last sequence.
  let k = end - 1;
  while (k >= 0 && k > end - 4 && (bytes[k]! & 0xc0) === 0x80) k--;
  if (k < 0) return bytes;
  const lead = bytes[k]!;
  const length = lead >= 0xf0 ? 4 : lead >= 0xe0 ? 3 : lead >= 0xc0 ? 2 : 1;
  if (k + length > end) end = k;
  return bytes.subarray(0, end);
}
