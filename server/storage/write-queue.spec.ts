import { describe, expect, it } from 'vitest';
import { WriteQueue, type WriteUnit } from './write-queue.js';

interface Unit extends WriteUnit {
  id: string;
}

const unit = (id: string, frames = 1, samples = 20): Unit => ({ id, frames, samples });

/** A queue over a fake database that is up, down, or refuses particular units. */
function harness(maxPendingSamples = 1000) {
  const db = { up: true, stored: [] as string[], refuse: new Set<string>() };
  const clock = { now: 0 };
  const outages: boolean[] = [];
  const queue = new WriteQueue<Unit>({
    write: async (units) => {
      if (!db.up) throw new Error('connection refused');
      if (units.some((u) => db.refuse.has(u.id))) throw new Error('value out of range');
      db.stored.push(...units.map((u) => u.id));
    },
    probe: async () => {
      if (!db.up) throw new Error('connection refused');
    },
    maxPendingSamples,
    retryMinMs: 100,
    retryMaxMs: 400,
    now: () => clock.now,
    onOutageChange: (outage) => outages.push(outage),
  });
  return { db, clock, outages, queue };
}

describe('WriteQueue', () => {
  it('writes what is queued and reports nothing pending', async () => {
    const { db, queue } = harness();
    queue.offer(unit('a'));
    queue.offer(unit('b'));
    await queue.flush();
    expect(db.stored).toEqual(['a', 'b']);
    expect(queue.state()).toMatchObject({ pendingFrames: 0, pendingSamples: 0, framesDropped: 0, flushErrors: 0, outage: false });
  });

  it('keeps every unit through a database outage, counts the failed attempts, and writes them once it is back', async () => {
    const { db, clock, outages, queue } = harness();
    db.up = false;
    queue.offer(unit('a'));
    await queue.flush();
    queue.offer(unit('b'));
    await queue.flush(); // inside the retry pause: no attempt
    expect(queue.state()).toMatchObject({ pendingFrames: 2, pendingSamples: 40, framesDropped: 0, flushErrors: 1, outage: true, lastError: 'connection refused' });
    expect(queue.state().failingSince).toBe(new Date(0).toISOString());
    clock.now = 100;
    await queue.flush();
    expect(queue.state().flushErrors).toBe(2);
    db.up = true;
    clock.now = 250; // the pause has doubled to 200 ms
    await queue.flush();
    expect(db.stored).toEqual([]);
    clock.now = 300;
    await queue.flush();
    expect(db.stored).toEqual(['a', 'b']);
    expect(queue.state()).toMatchObject({ pendingFrames: 0, framesDropped: 0, outage: false, failingSince: null, lastError: null });
    expect(outages).toEqual([true, false]);
  });

  it('refuses new units beyond its bound and counts their frames as dropped', () => {
    const { queue } = harness(50);
    expect(queue.offer(unit('a', 1, 20))).toBe(true);
    expect(queue.offer(unit('b', 1, 20))).toBe(true);
    expect(queue.offer(unit('c', 3, 20))).toBe(false);
    expect(queue.state()).toMatchObject({ pendingFrames: 2, pendingSamples: 40, framesDropped: 3 });
  });

  it('drops only the unit the database refuses while it answers, and stores the others', async () => {
    const { db, outages, queue } = harness();
    db.refuse.add('bad');
    queue.offer(unit('a'));
    queue.offer(unit('bad', 2));
    queue.offer(unit('c'));
    await queue.flush();
    expect(db.stored).toEqual(['a', 'c']);
    expect(queue.state()).toMatchObject({ pendingFrames: 0, framesDropped: 2, flushErrors: 2, outage: false });
    expect(outages).toEqual([]);
  });

  it('counts what is still unwritten at close as dropped', async () => {
    const { db, queue } = harness();
    db.up = false;
    queue.offer(unit('a', 4));
    await queue.close();
    expect(queue.state()).toMatchObject({ pendingFrames: 0, pendingSamples: 0, framesDropped: 4 });
  });
});
