import { describe, expect, it } from 'vitest';
import { auditLog, logbookAttachments, logbookEntries } from '../db/schema.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { findEntries, insertEntry } from './logbook-repository.js';

describe('logbook storage', () => {
  const database = useTempDatabase();

  it('writes the entry, its files and the audit record together, and refuses to change or delete any of them', async () => {
    const { db } = database;
    const input = { text: 'Coil x flushed.', tags: ['cooling'], at: null, link: null, amends: null };
    const id = await insertEntry(db, 'operator@tiltwatch.example', input, [{ fileName: 'a.csv', contentType: 'text/csv', data: new TextEncoder().encode('a,b\n1,2\n') }]);
    const [entry] = await findEntries(db, { limit: 10 });
    expect(entry).toMatchObject({ id, text: 'Coil x flushed.', attachments: [{ fileName: 'a.csv', sizeBytes: 8 }] });
    const audit = await db.select().from(auditLog);
    expect(audit).toContainEqual(expect.objectContaining({ action: 'logbook.write', subject: `logbook:${id}`, actor: 'operator@tiltwatch.example' }));

    const refused = (table: string) => ({ cause: expect.objectContaining({ message: expect.stringMatching(new RegExp(`${table} is append-only`)) }) });
    await expect(db.update(logbookEntries).set({ text: 'rewritten' })).rejects.toMatchObject(refused('logbook_entries'));
    await expect(db.delete(logbookEntries)).rejects.toMatchObject(refused('logbook_entries'));
    await expect(db.update(logbookAttachments).set({ fileName: 'b.csv' })).rejects.toMatchObject(refused('logbook_attachments'));
    await expect(db.delete(logbookAttachments)).rejects.toMatchObject(refused('logbook_attachments'));
  });

  it('leaves nothing behind when part of the write fails', async () => {
    const { db } = database;
    const before = (await findEntries(db, { limit: 100 })).length;
    // An amendment of an entry that does not exist breaks the foreign key after the entry row was inserted.
    const input = { text: 'Orphan correction.', tags: [], at: null, link: null, amends: 999_999 };
    await expect(insertEntry(db, 'operator@tiltwatch.example', input, [])).rejects.toThrow();
    expect((await findEntries(db, { limit: 100 })).length).toBe(before);
  });
});
