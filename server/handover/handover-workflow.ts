/**
 * The handover's life: a draft filled from the shift's records, edited by its author (or a
 * lead), submitted (the records filled again up to that moment, new open items numbered),
 * accepted by someone else — never the person who wrote or submitted it — and then frozen.
 * Each step is one transaction with its audit record; the database refuses changes to an
 * accepted handover as well (drizzle/, trigger `handovers_frozen`).
 */
import { desc, eq, inArray, isNull, or } from 'drizzle-orm';
import { hasRole, type Role } from '../../shared/auth/roles.js';
import type { Handover, HandoverItem, HandoverListItem, HandoverNotes } from '../../shared/handover/handover-api.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { handoverItems, handovers } from '../db/schema.js';
import { HttpError } from '../http/http-error.js';
import { fillHandoverRecord, type HandoverSources } from './handover-record.js';

export interface Person {
  email: string;
  role: Role;
}

export interface DraftEdit {
  summary?: string;
  notes?: HandoverNotes;
  openItems?: { text: string }[];
}

/** How far back the very first handover reaches, without an accepted one before it. */
const FIRST_PERIOD_MS = 12 * 3_600_000;

type Row = typeof handovers.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export class HandoverWorkflow {
  constructor(
    private readonly sources: HandoverSources,
    private readonly now: () => number = Date.now,
  ) {}

  private get db(): Db {
    return this.sources.db;
  }

  /** A new draft covering the records since the last accepted handover; 409 while another is open. */
  async createDraft(author: Person): Promise<Handover> {
    const open = await this.db.select({ id: handovers.id, status: handovers.status }).from(handovers).where(inArray(handovers.status, ['draft', 'submitted']));
    if (open.length > 0) {
      throw new HttpError(409, `Handover ${open[0].id} is still ${open[0].status === 'draft' ? 'a draft' : 'waiting to be accepted'}; finish it before starting another`);
    }
    const [previous] = await this.db.select({ periodTo: handovers.periodTo }).from(handovers).where(eq(handovers.status, 'accepted')).orderBy(desc(handovers.periodTo)).limit(1);
    const to = new Date(this.now());
    const from = previous?.periodTo ?? new Date(to.getTime() - FIRST_PERIOD_MS);
    const record = await fillHandoverRecord(this.sources, from, to);
    const carried = await this.db.select({ id: handoverItems.id }).from(handoverItems).where(isNull(handoverItems.closedAt));
    let id: number;
    try {
      id = await this.db.transaction(async (tx) => {
        const [row] = await tx
          .insert(handovers)
          .values({ status: 'draft', author: author.email, createdAt: to, periodFrom: from, periodTo: to, record, carriedItemIds: carried.map((c) => c.id) })
          .returning({ id: handovers.id });
        await appendAudit(tx, { actor: author.email, action: 'handover.draft', subject: `handover:${row.id}`, newValue: { periodFrom: from.toISOString(), periodTo: to.toISOString() } });
        return row.id;
      });
    } catch (error) {
      // The one-open index: someone else started a draft at the same moment.
      if (/handovers_one_open/.test(String((error as { cause?: unknown }).cause ?? error))) throw new HttpError(409, 'Another handover was started just now; open it instead');
      throw error;
    }
    return this.get(id);
  }

  async get(id: number): Promise<Handover> {
    return this.view(this.db, await this.row(this.db, id));
  }

  async list(): Promise<HandoverListItem[]> {
    const rows = await this.db.select().from(handovers).orderBy(desc(handovers.id)).limit(200);
    return rows.map((r) => ({
      id: r.id,
      status: r.status,
      author: r.author,
      createdAt: r.createdAt.toISOString(),
      periodFrom: r.periodFrom.toISOString(),
      periodTo: r.periodTo.toISOString(),
      submitted: r.submittedBy && r.submittedAt ? { by: r.submittedBy, at: r.submittedAt.toISOString() } : null,
      accepted: r.acceptedBy && r.acceptedAt ? { by: r.acceptedBy, at: r.acceptedAt.toISOString() } : null,
    }));
  }

  /** Changes the person's additions while a draft; only its author or a lead. */
  async edit(id: number, person: Person, edit: DraftEdit): Promise<Handover> {
    if (edit.summary === undefined && edit.notes === undefined && edit.openItems === undefined) {
      throw new HttpError(400, 'Nothing to change: send summary, notes or openItems');
    }
    await this.db.transaction(async (tx) => {
      const row = await this.row(tx, id, true);
      this.mayChange(row, person);
      await tx
        .update(handovers)
        .set({
          ...(edit.summary !== undefined ? { summary: edit.summary } : {}),
          ...(edit.notes !== undefined ? { notes: edit.notes } : {}),
          ...(edit.openItems !== undefined ? { newItems: edit.openItems } : {}),
        })
        .where(eq(handovers.id, id));
      await appendAudit(tx, { actor: person.email, action: 'handover.edit', subject: `handover:${id}`, newValue: edit });
    });
    return this.get(id);
  }

  /** Fills the records again up to now, numbers the new open items and marks it submitted. */
  async submit(id: number, person: Person): Promise<Handover> {
    const before = await this.row(this.db, id);
    this.mayChange(before, person);
    const to = new Date(this.now());
    const record = await fillHandoverRecord(this.sources, before.periodFrom, to);
    await this.db.transaction(async (tx) => {
      const row = await this.row(tx, id, true);
      this.mayChange(row, person);
      if (row.newItems.length > 0) {
        await tx.insert(handoverItems).values(row.newItems.map((item) => ({ text: item.text, handoverId: id, openedBy: row.author, openedAt: to })));
      }
      await tx.update(handovers).set({ status: 'submitted', submittedBy: person.email, submittedAt: to, periodTo: to, record }).where(eq(handovers.id, id));
      await appendAudit(tx, { actor: person.email, action: 'handover.submit', subject: `handover:${id}`, newValue: { periodTo: to.toISOString(), newItems: row.newItems.length } });
    });
    return this.get(id);
  }

  /** Accepted by the incoming person: never its author or submitter (409); frozen afterwards. */
  async accept(id: number, person: Person, comment: string | null): Promise<Handover> {
    await this.db.transaction(async (tx) => {
      const row = await this.row(tx, id, true);
      if (row.status === 'accepted') throw new HttpError(409, `Handover ${id} was accepted by ${row.acceptedBy} and cannot change`);
      if (row.status === 'draft') throw new HttpError(409, `Handover ${id} is still a draft: its author submits it first`);
      if (person.email === row.submittedBy || person.email === row.author) {
        throw new HttpError(409, 'You handed this shift over; the incoming operator or a lead accepts it');
      }
      const acceptedAt = new Date(this.now());
      const items = await this.items(tx, row);
      await tx.update(handovers).set({ status: 'accepted', acceptedBy: person.email, acceptedAt, acceptComment: comment, itemsAtAcceptance: items }).where(eq(handovers.id, id));
      await appendAudit(tx, { actor: person.email, action: 'handover.accept', subject: `handover:${id}`, newValue: { comment }, at: acceptedAt });
    });
    return this.get(id);
  }

  /** Closes an open item with a note (any operator). */
  async closeItem(itemId: number, person: Person, note: string): Promise<HandoverItem> {
    return this.db.transaction(async (tx) => {
      const [item] = await tx.select().from(handoverItems).where(eq(handoverItems.id, itemId)).for('update');
      if (!item) throw new HttpError(404, `No open item ${itemId}`);
      if (item.closedAt) throw new HttpError(409, `Item ${itemId} was closed by ${item.closedBy} already`);
      const closedAt = new Date(this.now());
      await tx.update(handoverItems).set({ closedAt, closedBy: person.email, closeNote: note }).where(eq(handoverItems.id, itemId));
      await appendAudit(tx, { actor: person.email, action: 'handover.item-close', subject: `handover-item:${itemId}`, oldValue: { text: item.text }, reason: note, at: closedAt });
      return { id: item.id, text: item.text, openedBy: item.openedBy, openedAt: item.openedAt.toISOString(), carried: true, closed: { at: closedAt.toISOString(), by: person.email, note } };
    });
  }

  private mayChange(row: Row, person: Person): void {
    if (row.status !== 'draft') {
      throw new HttpError(409, row.status === 'accepted' ? `Handover ${row.id} was accepted by ${row.acceptedBy} and cannot change` : `Handover ${row.id} was submitted and waits to be accepted; it cannot change`);
    }
    if (person.email !== row.author && !hasRole(person.role, 'lead')) {
      throw new HttpError(403, `Only ${row.author}, who started this handover, or a lead may change it`);
    }
  }

  private async row(db: Db | Tx, id: number, lock = false): Promise<Row> {
    const query = db.select().from(handovers).where(eq(handovers.id, id));
    const [row] = lock ? await query.for('update') : await query;
    if (!row) throw new HttpError(404, `No handover ${id}`);
    return row;
  }

  private async view(db: Db | Tx, row: Row): Promise<Handover> {
    return {
      id: row.id,
      status: row.status,
      author: row.author,
      createdAt: row.createdAt.toISOString(),
      periodFrom: row.periodFrom.toISOString(),
      periodTo: row.periodTo.toISOString(),
      record: row.record,
      summary: row.summary,
      notes: row.notes,
      openItems: row.itemsAtAcceptance ?? (await this.items(db, row)),
      submitted: row.submittedBy && row.submittedAt ? { by: row.submittedBy, at: row.submittedAt.toISOString() } : null,
      accepted: row.acceptedBy && row.acceptedAt ? { by: row.acceptedBy, at: row.acceptedAt.toISOString(), comment: row.acceptComment } : null,
    };
  }

  /** Carried items with their present state, then this handover's own (numbered once submitted). */
  private async items(db: Db | Tx, row: Row): Promise<HandoverItem[]> {
    const own = row.status === 'draft' ? [] : [eq(handoverItems.handoverId, row.id)];
    const carriedIds = row.carriedItemIds.length > 0 ? [inArray(handoverItems.id, row.carriedItemIds)] : [];
    const conditions = [...carriedIds, ...own];
    const rows = conditions.length === 0 ? [] : await db.select().from(handoverItems).where(or(...conditions)).orderBy(handoverItems.id);
    const stored = rows.map(
      (r): HandoverItem => ({
        id: r.id,
        text: r.text,
        openedBy: r.openedBy,
        openedAt: r.openedAt.toISOString(),
        carried: r.handoverId !== row.id,
        closed: r.closedAt && r.closedBy ? { at: r.closedAt.toISOString(), by: r.closedBy, note: r.closeNote ?? '' } : null,
      }),
    );
    const drafted = row.status === 'draft' ? row.newItems.map((item): HandoverItem => ({ id: null, text: item.text, openedBy: row.author, openedAt: null, carried: false, closed: null })) : [];
    return [...stored, ...drafted];
  }
}
