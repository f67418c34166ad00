/**
 * Decides what an uploaded file is from its bytes, never from its name or the type the
 * browser claimed: images and PDF by their signature (magic bytes, read by the `file-type`
 * package), CSV as well-formed UTF-8 text without control characters. Anything else — SVG
 * and HTML included, which a browser could run — is refused.
 */
import { fileTypeFromBuffer } from 'file-type';
import { ATTACHMENT_TYPES_TEXT, MAX_ATTACHMENT_BYTES } from '../../shared/logbook/logbook-api.js';

/** Types served as they are, by the signature `file-type` finds. */
const BINARY_TYPES = new Set(['image/png', 'image/jpeg', 'image/gif', 'image/webp', 'application/pdf']);
export const CSV_TYPE = 'text/csv';

export interface CheckedFile {
  fileName: string;
  contentType: string;
  data: Uint8Array;
}

export type FileVerdict = { ok: true; file: CheckedFile } | { ok: false; problem: string };

/** Longest stored file name, characters. */
const MAX_NAME_CHARS = 160;

/** Checks one upload; `problem` says, naming the file, why it is refused. */
export async function checkAttachment(originalName: string, data: Uint8Array): Promise<FileVerdict> {
  const fileName = cleanFileName(originalName);
  const refuse = (why: string): FileVerdict => ({ ok: false, problem: `attachment "${fileName}" ${why}` });
  if (data.byteLength === 0) return refuse('is empty');
  if (data.byteLength > MAX_ATTACHMENT_BYTES) return refuse(`is larger than ${MAX_ATTACHMENT_BYTES / (1024 * 1024)} MB`);
  const found = await fileTypeFromBuffer(data);
  if (found && BINARY_TYPES.has(found.mime)) return { ok: true, file: { fileName, contentType: found.mime, data } };
  if (found) return refuse(`is ${found.mime} by its content; accepted are ${ATTACHMENT_TYPES_TEXT}`);
  if (/\.csv$/i.test(fileName) && isPlainText(data)) return { ok: true, file: { fileName, contentType: CSV_TYPE, data } };
  return refuse(`is not one of the accepted types by its content; accepted are ${ATTACHMENT_TYPES_TEXT} (CSV as UTF-8 text named .csv)`);
}

/** Well-formed UTF-8 with no control characters other than tab, line feed and carriage return. */
function isPlainText(data: Uint8Array): boolean {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(data);
  } catch {
    return false;
  }
  // eslint-disable-next-line no-control-regex
  return !/[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/.test(text);
}

/** The last path part of a client's file name, without control characters, at most 160 characters. */
export function cleanFileName(name: string): string {
  const base = name.split(/[/\\]/).pop() ?? '';
  // eslint-disable-next-line no-control-regex
  const clean = base.replace(/[\u0000-\u001F\u007F"]/g, '_').trim().slice(0, MAX_NAME_CHARS);
  return clean === '' || clean === '.' || clean === '..' ? 'attachment' : clean;
}

/**
 * `Content-Disposition` for serving a stored file: images inline (shown in the timeline),
 * everything else as a download; an ASCII fallback name plus the exact UTF-8 name (RFC 6266).
 */
export function contentDisposition(fileName: string, contentType: string): string {
  const kind = contentType.startsWith('image/') ? 'inline' : 'attachment';
  const ascii = fileName.replace(/[^\x20-\x7E]/g, '_').replace(/["\\]/g, '_');
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}
