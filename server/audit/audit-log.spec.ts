import { describe, expect, it } from 'vitest';
import { auditLog } from '../db/schema.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { appendAudit } from './audit-log.js';

describe('audit trail', () => {
  const database = useTempDatabase();

  it('refuses to change or delete audit entries', async () => {
    const { db } = database;
    await appendAudit(db, { actor: 'lead@tiltwatch.example', action: 'test.entry', subject: 'nothing', reason: 'checking the trail' });
    const refused = { cause: expect.objectContaining({ message: expect.stringMatching(/audit_log is append-only/) }) };
    await expect(db.update(auditLog).set({ actor: 'someone else' })).rejects.toMatchObject(refused);
    await expect(db.delete(auditLog)).rejects.toMatchObject(refused);
    const rows = await db.select().from(auditLog);
    expect(rows).toEqual([expect.objectContaining({ actor: 'lead@tiltwatch.example', action: 'test.entry', reason: 'checking the trail' })]);
  });
});
