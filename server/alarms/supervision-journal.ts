/**
 * The supervision journal: an append-only file in the data folder holding every supervision
 * record (a trip, a batch of alarm transitions) from the moment it is made until the database
 * has it. `append` writes one JSON line before it returns, so a record survives a database
 * outage and a process stop or kill in between (the operating system holds what a killed
 * process wrote), and asks the operating system to flush it to the disk (fsync) in Node's
 * thread pool, so the event loop never waits for the disk; the owner writes the pending records
 * to the database in order and calls `written` for each, and once none is pending the file is
 * emptied. Each record carries a unique id, stored with it in the database
 * (`supervision_records_applied`), so replaying a record whose write committed but whose
 * confirmation was lost does not store it twice. Such a replay can only take records the file
 * still holds (`recordIds`), so the ids of all other records may be forgotten.
 *
 * Bounded: beyond `maxBytes` new alarm transitions are refused and counted; trips are always
 * kept (one per latch: a reset needs the database, so an outage holds at most one or two).
 */
import { closeSync, fstatSync, fsync, fsyncSync, ftruncateSync, openSync, readFileSync, writeSync } from 'node:fs';
import { promisify } from 'node:util';
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import type { TripRecord } from '../interlock/interlock.js';
import type { AlarmEvent, AlarmMemory } from './alarm-state.js';

/** File name of the journal inside the data folder. */
export const SUPERVISION_JOURNAL_FILE = 'supervision-journal.ndjson';

/** One record of the journal, as written to the database. */
export type SupervisionRecord =
  | { id: string; kind: 'trip'; trip: TripRecord }
  | {
      id: string;
      kind: 'alarm-events';
      /** When the states were taken, Unix epoch ms (a stored state newer than this is kept). */
      atMs: number;
      events: AlarmEvent[];
      /** The states of the alarms the events changed, as they were at `atMs`. */
      states: [string, AlarmMemory][];
    };

type WithoutId<T> = T extends unknown ? Omit<T, 'id'> : never;
/** A record before it gets its id. */
export type NewSupervisionRecord = WithoutId<SupervisionRecord>;

/** The journal on `/api/health` (under `supervision`). */
export interface JournalCounters {
  /** Records in the journal not yet in the database. */
  journalPending: number;
  /** Size of the journal file, bytes. */
  journalBytes: number;
  /** Alarm-transition records refused because the journal was full. */
  journalDropped: number;
  /** Lines of the file that could not be read at start (a write cut off by a crash). */
  journalUnreadable: number;
  /** Flushes to the disk (fsync) the operating system refused. */
  journalSyncErrors: number;
}

export interface SupervisionJournalOptions {
  /** Largest journal file, bytes (default 8 MiB). */
  maxBytes?: number;
}

export class SupervisionJournal {
  private readonly fd: number;
  private readonly pendingRecords: SupervisionRecord[] = [];
  /** Ids of the records in the file: pending, and written but not yet emptied out. */
  private readonly idsInFile = new Set<string>();
  private bytes = 0;
  private dropped = 0;
  private unreadable = 0;
  private syncErrors = 0;
  private readonly maxBytes: number;

  /** Opens (or creates) the journal in `dataDir` and reads what an earlier run left in it. */
  constructor(dataDir: string, opts: SupervisionJournalOptions = {}) {
    this.maxBytes = opts.maxBytes ?? 8 * 1024 * 1024;
    const file = path.join(dataDir, SUPERVISION_JOURNAL_FILE);
    this.fd = openSync(file, 'a+', 0o600);
    const text = readFileSync(this.fd, 'utf8');
    // Only lines ended by a newline were written whole; a cut-off last line is dropped from the file.
    const complete = text.lastIndexOf('\n') + 1;
    for (const line of text.slice(0, complete).split('\n')) {
      if (line === '') continue;
      const record = parseRecord(line);
      if (record) {
        this.pendingRecords.push(record);
        this.idsInFile.add(record.id);
      } else this.unreadable++;
    }
    if (complete < text.length) {
      this.unreadable++;
      ftruncateSync(this.fd, Buffer.byteLength(text.slice(0, complete)));
      fsyncSync(this.fd);
    }
    this.bytes = fstatSync(this.fd).size;
  }

  /**
   * Appends `record` (written to the file before this returns, flushed to the disk in the
   * background) and returns it with its id; null when the journal is full and the record is an
   * alarm-transition batch (counted).
   */
  append(record: NewSupervisionRecord): SupervisionRecord | null {
    const stored = { id: randomUUID(), ...record } as SupervisionRecord;
    const line = Buffer.from(`${JSON.stringify(stored)}\n`);
    if (stored.kind !== 'trip' && this.bytes + line.length > this.maxBytes) {
      this.dropped++;
      return null;
    }
    writeSync(this.fd, line);
    this.flushToDisk();
    this.bytes += line.length;
    this.pendingRecords.push(stored);
    this.idsInFile.add(stored.id);
    return stored;
  }

  /** Records not yet in the database, oldest first. */
  pending(): readonly SupervisionRecord[] {
    return this.pendingRecords;
  }

  /**
   * Ids of every record in the file: the pending ones and those written since the file was last
   * emptied. Only these can be read again at the next start. Once `sync()` has resolved, the
   * disk holds no record outside this list.
   */
  recordIds(): string[] {
    return [...this.idsInFile];
  }

  /** Resolves once everything written to the file so far, an emptying included, is on the disk (fsync in the thread pool). */
  sync(): Promise<void> {
    return promisify(fsync)(this.fd);
  }

  /** The database has `id`: it leaves the pending list, and once none is left the file is emptied. */
  written(id: string): void {
    const index = this.pendingRecords.findIndex((r) => r.id === id);
    if (index >= 0) this.pendingRecords.splice(index, 1);
    if (this.pendingRecords.length === 0 && this.bytes > 0) {
      ftruncateSync(this.fd, 0);
      this.flushToDisk();
      this.bytes = 0;
      this.idsInFile.clear();
    }
  }

  counters(): JournalCounters {
    return {
      journalPending: this.pendingRecords.length,
      journalBytes: this.bytes,
      journalDropped: this.dropped,
      journalUnreadable: this.unreadable,
      journalSyncErrors: this.syncErrors,
    };
  }

  close(): void {
    fsyncSync(this.fd);
    closeSync(this.fd);
  }

  private flushToDisk(): void {
    fsync(this.fd, (error) => {
      // EBADF: the journal was closed meanwhile, and close() flushed it.
      if (error && error.code !== 'EBADF') this.syncErrors++;
    });
  }
}

function parseRecord(line: string): SupervisionRecord | null {
  try {
    const record = JSON.parse(line) as SupervisionRecord;
    return typeof record?.id === 'string' && (record.kind === 'trip' || record.kind === 'alarm-events') ? record : null;
  } catch {
    return null;
  }
}
