/**
 * Shapes of the logbook API (`/api/logbook/...`), shared by the server and the web app.
 * Plain TypeScript without dependencies, safe in the browser.
 */

/** What an entry may point at: an alarm (by alarm id), an interlock trip, a run or a shot. */
export const LOGBOOK_LINK_KINDS = ['alarm', 'trip', 'run', 'shot'] as const;
export type LogbookLinkKind = (typeof LOGBOOK_LINK_KINDS)[number];

export interface LogbookLink {
  kind: LogbookLinkKind;
  /** The alarm id, the time a trip happened (ISO 8601), or the number of a run or shot. */
  ref: string;
}

export interface LogbookAttachment {
  id: number;
  fileName: string;
  /** Type found from the content, e.g. `image/png`, `application/pdf`, `text/csv`. */
  contentType: string;
  sizeBytes: number;
  /** Where to fetch the file (signed-in, like every API call). */
  url: string;
}

export interface LogbookEntry {
  id: number;
  /** The time the note refers to (ISO 8601). */
  at: string;
  /** When it was written (ISO 8601). */
  createdAt: string;
  /** E-mail of the writer. */
  author: string;
  /** Markdown source; the web app renders it with raw HTML removed. */
  text: string;
  tags: string[];
  link: LogbookLink | null;
  /** The entry this one corrects, or null. */
  amends: number | null;
  /** Later entries that correct this one, oldest first. */
  amendedBy: number[];
  attachments: LogbookAttachment[];
}

export interface LogbookEntriesResponse {
  entries: LogbookEntry[];
}

export interface LogbookCreated {
  id: number;
}

/** Largest attachment, bytes (10 MiB). */
export const MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024;
/** Most attachments on one entry. */
export const MAX_ATTACHMENTS = 6;
/** Longest entry text, characters. */
export const MAX_ENTRY_CHARS = 20_000;
/** Most tags on one entry, and the longest tag. */
export const MAX_TAGS = 12;
export const MAX_TAG_CHARS = 40;

/** The attachment types accepted, as the screen names them. */
export const ATTACHMENT_TYPES_TEXT = 'images (PNG, JPEG, GIF, WebP), PDF or CSV';
