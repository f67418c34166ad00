/**
 * The edge of `POST /api/logbook/entries`: one reading of the fields whether they came as JSON
 * (`tags` an array, `link` text) or as multipart form fields (`tags` comma-separated or
 * repeated). Every problem is a 400 naming the field as the Logbook screen labels it.
 */
import { LOGBOOK_LINK_KINDS, MAX_ENTRY_CHARS, MAX_TAG_CHARS, MAX_TAGS, type LogbookLink, type LogbookLinkKind } from '../../shared/logbook/logbook-api.js';
import { z } from 'zod';
import { labelledInside } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import { textProblem } from '../../shared/validation/edge-rules.js';

export interface EntryInput {
  text: string;
  tags: string[];
  /** The time the note refers to; null for "now". */
  at: Date | null;
  link: LogbookLink | null;
  amends: number | null;
}

/** How far ahead of the server clock `at` may lie (clock differences between machines). */
const FUTURE_SLACK_MS = 5 * 60_000;
const FIELDS = ['text', 'tags', 'at', 'link', 'amends'];

/** How the logbook's entry form labels each field; refusals name fields by these labels. */
export const ENTRY_LABELS: Readonly<Record<string, string>> = { text: 'Entry', tags: 'Tags', at: 'Refers to', link: 'Linked to', amends: 'Corrects entry' };

/** The labels of an entry as the form shows them, for the generic edge check. */
export const EntryBody = labelledInside(z.unknown(), 'Entry', (path) => ENTRY_LABELS[String(path[0])] ?? null);

/** A 400 about one field of the entry, named as the form labels it and placed next to it. */
function refusal(field: keyof typeof ENTRY_LABELS, message: string): HttpError {
  return new HttpError(400, `${ENTRY_LABELS[field]}: ${message}`, field);
}

export function parseEntryInput(body: unknown, nowMs: number): EntryInput {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw new HttpError(400, 'Send a JSON object (or a multipart form) with at least "text"');
  }
  const fields = body as Record<string, unknown>;
  const unknown = Object.keys(fields).filter((k) => !FIELDS.includes(k));
  if (unknown.length > 0) throw new HttpError(400, `Unknown field(s) ${unknown.join(', ')}; an entry has ${FIELDS.join(', ')}`);
  return {
    text: parseText(fields['text']),
    tags: parseTags(fields['tags']),
    at: parseAt(fields['at'], nowMs),
    link: parseLink(fields['link']),
    amends: parseAmends(fields['amends']),
  };
}

function parseText(value: unknown): string {
  if (value !== undefined && typeof value !== 'string') throw refusal('text', 'must be text');
  const text = (value ?? '').trim();
  if (text === '') throw refusal('text', 'write what happened; an entry cannot be empty');
  if (text.length > MAX_ENTRY_CHARS) throw refusal('text', `at most ${MAX_ENTRY_CHARS} characters (this one has ${text.length})`);
  const problem = textProblem(text);
  if (problem) throw refusal('text', `${problem}`);
  return text;
}

/** Tags are lower-case words (letters, digits, `-`, `_`, `.`), without duplicates. */
function parseTags(value: unknown): string[] {
  if (value === undefined || value === null) return [];
  const raw = typeof value === 'string' ? value.split(',') : Array.isArray(value) ? value : null;
  if (raw === null || raw.some((t) => typeof t !== 'string')) throw refusal('tags', 'send a list of words (or one comma-separated text)');
  const tags = [...new Set((raw as string[]).flatMap((t) => t.split(',')).map((t) => t.trim().toLowerCase()).filter((t) => t !== ''))];
  if (tags.length > MAX_TAGS) throw refusal('tags', `at most ${MAX_TAGS}`);
  for (const tag of tags) {
    if (tag.length > MAX_TAG_CHARS || !/^[\p{L}\p{N}][\p{L}\p{N}._-]*$/u.test(tag)) {
      throw refusal('tags', `"${tag.slice(0, MAX_TAG_CHARS)}" is not a tag; use one word of letters, digits, "-", "_" or "." (at most ${MAX_TAG_CHARS} characters)`);
    }
  }
  return tags;
}

function parseAt(value: unknown, nowMs: number): Date | null {
  if (value === undefined || value === null || value === '') return null;
  if (typeof value !== 'string' || !/^\d{4}-\d{2}-\d{2}T/.test(value)) {
    throw refusal('at', 'must be a date and time such as 2026-12-02T06:15:00Z');
  }
  const at = new Date(value);
  if (Number.isNaN(at.getTime())) throw refusal('at', `"${value.slice(0, 40)}" is not a valid date and time`);
  if (at.getTime() > nowMs + FUTURE_SLACK_MS) throw refusal('at', 'must not lie in the future');
  if (at.getFullYear() < 2000) throw refusal('at', 'must not lie before the year 2000');
  return at;
}

/** `kind:ref`, e.g. `alarm:flow.x.LL`, `trip:2026-12-02T05:41:07.250Z`. */
function parseLink(value: unknown): LogbookLink | null {
  if (value === undefined || value === null || value === '') return null;
  const match = typeof value === 'string' ? /^([a-z]+):(\S{1,80})$/.exec(value.trim()) : null;
  if (!match || !(LOGBOOK_LINK_KINDS as readonly string[]).includes(match[1])) {
    throw refusal('link', `write kind:id with kind one of ${LOGBOOK_LINK_KINDS.join(', ')} (e.g. alarm:flow.x.LL)`);
  }
  const problem = textProblem(match[2]);
  if (problem) throw refusal('link', `${problem}`);
  return { kind: match[1] as LogbookLinkKind, ref: match[2] };
}

function parseAmends(value: unknown): number | null {
  if (value === undefined || value === null || value === '') return null;
  const n = typeof value === 'string' && /^\d{1,9}$/.test(value.trim()) ? Number(value) : value;
  if (typeof n !== 'number' || !Number.isInteger(n) || n < 1 || n > 2_147_483_647) {
    throw refusal('amends', 'must be the number of an existing entry');
  }
  return n;
}
