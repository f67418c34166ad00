import { parse } from 'csv-parse/sync';

/** One CSV record with the file line it starts on (header = line 1). */
export interface CsvRecord {
  cells: string[];
  line: number;
}

/** A plain decimal number, optionally with an exponent; nothing else (no hex, no Infinity, no spaces inside). */
export const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Reads an uploaded CSV file (comma-separated, `#` starts a comment line, blank lines skipped,
 * cells trimmed) with csv-parse. A file that is not readable text or CSV is refused through
 * `refuse`, which throws the caller's own error type with the message.
 */
export function readCsvRecords(text: string, refuse: (message: string) => never): CsvRecord[] {
  if (text.includes('\u0000')) refuse('the file contains a NUL character: upload the plain-text CSV file');
  try {
    // With `info: true` each record comes as { record, info }; the typings do not model that option.
    const records = parse(text, { bom: true, trim: true, skip_empty_lines: true, comment: '#', relax_column_count: true, info: true }) as unknown as {
      record: string[];
      info: { lines: number };
    }[];
    return records.map((r) => ({ cells: r.record, line: r.info.lines }));
  } catch (error) {
    const e = error as Error & { lines?: number };
    return refuse(`${e.lines ? `line ${e.lines}: ` : ''}the file is not readable as CSV (${e.message})`);
  }
}

/** A cell quoted back in a message: control characters and lone surrogates shown as \\u escapes, at most 40 characters. */
export function printable(raw: string): string {
  const shown = raw.length > 40 ? `${raw.slice(0, 40)}…` : raw;
  return shown.replace(/[\u0000-\u001f\u007f]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`);
}
