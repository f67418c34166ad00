/**
 * Storage of logbook entries and their attachments (append-only tables, see drizzle/). An entry,
 * its files and its audit record are written in one transaction; search uses PostgreSQL text
 * search on the GIN-indexed `search` column.
 */
import { and, asc, desc, eq, gt, gte, inArray, lte, sql, type SQL } from 'drizzle-orm';
import type { LogbookAttachment, LogbookEntry, LogbookLinkKind } from '../../shared/logbook/logbook-api.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { logbookAttachments, logbookEntries } from '../db/schema.js';
import type { CheckedFile } from './attachment-check.js';
import type { EntryInput } from './entry-input.js';

export interface EntryQuery {
  /** Words to search for (web-search syntax: "quoted phrases", -excluded, or). */
  q?: string;
  from?: Date;
  to?: Date;
  tag?: string;
  /** Written after `writtenFrom` and at or before `writtenTo` (a shift's entries). */
  writtenFrom?: Date;
  writtenTo?: Date;
  /** Most entries returned. */
  limit: number;
  /** Oldest first (default newest first). */
  oldestFirst?: boolean;
}

/** Stores an entry with its files and the audit record; returns its id. */
export async function insertEntry(db: Db, author: string, input: EntryInput, files: readonly CheckedFile[]): Promise<number> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(logbookEntries)
      .values({
        author,
        text: input.text,
        tags: input.tags,
        at: input.at ?? sql`now()`,
        linkKind: input.link?.kind ?? null,
        linkRef: input.link?.ref ?? null,
        amends: input.amends,
      })
      .returning({ id: logbookEntries.id });
    if (files.length > 0) {
      await tx.insert(logbookAttachments).values(
        files.map((f) => ({ entryId: row.id, fileName: f.fileName, contentType: f.contentType, sizeBytes: f.data.byteLength, data: f.data })),
      );
    }
    await appendAudit(tx, {
      actor: author,
      action: input.amends === null ? 'logbook.write' : 'logbook.amend',
      subject: `logbook:${row.id}`,
      oldValue: input.amends === null ? null : { amends: input.amends },
      newValue: {
        tags: input.tags,
        at: input.at?.toISOString() ?? null,
        link: input.link,
        attachments: files.map((f) => ({ fileName: f.fileName, contentType: f.contentType, sizeBytes: f.data.byteLength })),
      },
    });
    return row.id;
  });
}

export async function entryExists(db: Db, id: number): Promise<boolean> {
  const [row] = await db.select({ id: logbookEntries.id }).from(logbookEntries).where(eq(logbookEntries.id, id));
  return row !== undefined;
}

/** Entries matching `query`, newest `at` first, with attachments and amendments. */
export async function findEntries(db: Db, query: EntryQuery): Promise<LogbookEntry[]> {
  const where: SQL[] = [];
  if (query.q) where.push(sql`${logbookEntries.search} @@ websearch_to_tsquery('english', ${query.q})`);
  if (query.from) where.push(gte(logbookEntries.at, query.from));
  if (query.to) where.push(lte(logbookEntries.at, query.to));
  if (query.tag) where.push(sql`${logbookEntries.tags} @> ARRAY[${query.tag}]::text[]`);
  if (query.writtenFrom) where.push(gt(logbookEntries.createdAt, query.writtenFrom));
  if (query.writtenTo) where.push(lte(logbookEntries.createdAt, query.writtenTo));
  const order = query.oldestFirst ? [asc(logbookEntries.at), asc(logbookEntries.id)] : [desc(logbookEntries.at), desc(logbookEntries.id)];
  const rows = await db
    .select({
      id: logbookEntries.id,
      at: logbookEntries.at,
      createdAt: logbookEntries.createdAt,
      author: logbookEntries.author,
      text: logbookEntries.text,
      tags: logbookEntries.tags,
      linkKind: logbookEntries.linkKind,
      linkRef: logbookEntries.linkRef,
      amends: logbookEntries.amends,
    })
    .from(logbookEntries)
    .where(and(...where))
    .orderBy(...order)
    .limit(query.limit);
  return withDetails(db, rows);
}

interface EntryRow {
  id: number;
  at: Date;
  createdAt: Date;
  author: string;
  text: string;
  tags: string[];
  linkKind: LogbookLinkKind | null;
  linkRef: string | null;
  amends: number | null;
}

/** Adds attachments (metadata only) and the ids of amending entries. */
async function withDetails(db: Db, rows: readonly EntryRow[]): Promise<LogbookEntry[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const files = await db
    .select({ id: logbookAttachments.id, entryId: logbookAttachments.entryId, fileName: logbookAttachments.fileName, contentType: logbookAttachments.contentType, sizeBytes: logbookAttachments.sizeBytes })
    .from(logbookAttachments)
    .where(inArray(logbookAttachments.entryId, ids))
    .orderBy(asc(logbookAttachments.id));
  const amendments = await db
    .select({ id: logbookEntries.id, amends: logbookEntries.amends })
    .from(logbookEntries)
    .where(inArray(logbookEntries.amends, ids))
    .orderBy(asc(logbookEntries.id));
  return rows.map((r) => ({
    id: r.id,
    at: r.at.toISOString(),
    createdAt: r.createdAt.toISOString(),
    author: r.author,
    text: r.text,
    tags: r.tags,
    link: r.linkKind !== null && r.linkRef !== null ? { kind: r.linkKind, ref: r.linkRef } : null,
    amends: r.amends,
    amendedBy: amendments.filter((a) => a.amends === r.id).map((a) => a.id),
    attachments: files
      .filter((f) => f.entryId === r.id)
      .map((f): LogbookAttachment => ({ id: f.id, fileName: f.fileName, contentType: f.contentType, sizeBytes: f.sizeBytes, url: `/api/logbook/attachments/${f.id}` })),
  }));
}

/** One stored file with its bytes, or null. */
export async function findAttachment(db: Db, id: number): Promise<{ fileName: string; contentType: string; data: Uint8Array } | null> {
  const [row] = await db
    .select({ fileName: logbookAttachments.fileName, contentType: logbookAttachments.contentType, data: logbookAttachments.data })
    .from(logbookAttachments)
    .where(eq(logbookAttachments.id, id));
  return row ?? null;
}
