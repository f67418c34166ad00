import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import type { HandoverRecord } from '../../shared/handover/handover-api.js';
import { handoverItems, handovers } from '../db/schema.js';
import { useTempDatabase } from '../testing/temp-database.js';

/** The database's own guards behind the workflow: frozen once accepted, one open at a time, items only closed. */
describe('handover storage guards', () => {
  const database = useTempDatabase();
  const record = { filledAt: '2026-12-02T06:00:00.000Z' } as HandoverRecord;
  const period = { periodFrom: new Date('2026-12-01T18:00:00Z'), periodTo: new Date('2026-12-02T06:00:00Z') };


  it('refuses any change to an accepted handover and any deletion', async () => {
    const { db } = database;
    const [row] = await db.insert(handovers).values({ status: 'accepted', author: 'operator@tiltwatch.example', record, ...period }).returning();
    const refused = (pattern: RegExp) => ({ cause: expect.objectContaining({ message: expect.stringMatching(pattern) }) });
    await expect(db.update(handovers).set({ summary: 'rewritten' }).where(eq(handovers.id, row.id))).rejects.toMatchObject(refused(/accepted and frozen/));
    await expect(db.delete(handovers).where(eq(handovers.id, row.id))).rejects.toMatchObject(refused(/DELETE refused/));
  });

  it('keeps at most one handover open, and lets an item only be closed, once', async () => {
    const { db } = database;
    const [draft] = await db.insert(handovers).values({ status: 'draft', author: 'operator@tiltwatch.example', record, ...period }).returning();
    await expect(db.insert(handovers).values({ status: 'submitted', author: 'lead@tiltwatch.example', record, ...period })).rejects.toMatchObject({
      cause: expect.objectContaining({ message: expect.stringMatching(/handovers_one_open/) }),
    });
    const [item] = await db.insert(handoverItems).values({ text: 'Check the chiller.', handoverId: draft.id, openedBy: 'operator@tiltwatch.example' }).returning();
    await expect(db.update(handoverItems).set({ text: 'Something else.' }).where(eq(handoverItems.id, item.id))).rejects.toThrow();
    await db.update(handoverItems).set({ closedAt: new Date(), closedBy: 'lead@tiltwatch.example', closeNote: 'done' }).where(eq(handoverItems.id, item.id));
    await expect(db.update(handoverItems).set({ closeNote: 'changed my mind' }).where(eq(handoverItems.id, item.id))).rejects.toThrow();
    await expect(db.delete(handoverItems)).rejects.toThrow();
  });
});
