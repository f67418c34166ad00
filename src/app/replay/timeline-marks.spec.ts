import { describe, expect, it } from 'vitest';
import type { HistoryEvent } from './history-api';
import { MARK_LOOK, placeMarks } from './timeline-marks';

const FROM = Date.parse('2026-12-01T21:00:00Z');
const TO = FROM + 600_000;

describe('placeMarks', () => {
  it('places events by time along the window, oldest first, with kind word and text', () => {
    const events: HistoryEvent[] = [
      { at: new Date(FROM + 450_000).toISOString(), kind: 'trip', reason: 'X coil temperature beyond trip level' },
      { at: FROM + 150_000, kind: 'alarm', message: 'X coil temperature high' },
      { at: new Date(FROM).toISOString(), kind: 'run', label: 'θ scan' },
      { at: new Date(TO).toISOString(), kind: 'shot' },
    ];
    const marks = placeMarks(events, FROM, TO);
    expect(marks.map((m) => [m.kind, m.percent])).toEqual([
      ['run', 0],
      ['alarm', 25],
      ['trip', 75],
      ['shot', 100],
    ]);
    expect(marks[1].text).toMatch(/^Alarm \d\d:\d\d:\d\d: X coil temperature high$/);
    expect(marks[2].text).toMatch(/^Trip .*beyond trip level$/);
    expect(marks[3].text).toMatch(/^Shot \d\d:\d\d:\d\d$/);
  });

  it('leaves out events outside the window, of unreadable time or of an unknown kind', () => {
    const events = [
      { at: FROM - 1, kind: 'alarm' },
      { at: TO + 1, kind: 'note' },
      { at: 'not a time', kind: 'note' },
      { at: FROM + 1, kind: 'weather' },
    ] as unknown as HistoryEvent[];
    expect(placeMarks(events, FROM, TO)).toEqual([]);
  });

  it('gives every kind its own shape and word', () => {
    const looks = Object.values(MARK_LOOK);
    expect(new Set(looks.map((l) => l.icon)).size).toBe(looks.length);
    expect(new Set(looks.map((l) => l.label)).size).toBe(looks.length);
  });
});
