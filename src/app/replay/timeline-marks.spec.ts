import { describe, expect, it } from 'vitest';
import type { HistoryEvent } from '../../../shared/history/history-api';
import { MARK_LOOK, placeMarks } from './timeline-marks';

function event(t: number, kind: HistoryEvent['kind'], label: string, detail: string | null = null): HistoryEvent {
  return { at: Number.isFinite(t) ? new Date(t).toISOString() : 'not a time', t, kind, id: '1', label, actor: null, detail };
}

const FROM = Date.parse('2026-12-01T21:00:00Z');
const TO = FROM + 600_000;

describe('placeMarks', () => {
  it('places events by time along the window, oldest first, with kind word and text', () => {
    const events: HistoryEvent[] = [
      event(FROM + 450_000, 'trip', 'Interlock trip, first out: X coil temperature'),
      event(FROM + 150_000, 'alarm', 'Alarm temperature.x.H (medium): raise', 'a reason text that stays off the mark'),
      event(FROM, 'run', 'Run 7 started: sequence "θ scan" version 3'),
      event(FROM + 60_000, 'step', 'Run 7 step 1: ramp to |B| 7 G, θ 50°, φ 0° over 1.0 s', 'Done after 1.0 s'),
      event(TO, 'shot', ''),
    ];
    const marks = placeMarks(events, FROM, TO);
    expect(marks.map((m) => [m.kind, m.percent])).toEqual([
      ['run', 0],
      ['step', 10],
      ['alarm', 25],
      ['trip', 75],
      ['shot', 100],
    ]);
    expect(marks[1].text).toMatch(/^Run step at \d\d:\d\d:\d\d — Run 7 step 1: ramp to \|B\| 7 G, θ 50°, φ 0° over 1\.0 s\. Done after 1\.0 s$/);
    expect(marks[2].text).toMatch(/^Alarm at \d\d:\d\d:\d\d — Alarm temperature\.x\.H \(medium\): raise$/);
    expect(marks[3].text).toMatch(/^Trip at .* — Interlock trip, first out: X coil temperature$/);
    expect(marks[4].text).toMatch(/^Shot at \d\d:\d\d:\d\d — Shot$/);
  });

  it('leaves out events outside the window, of unreadable time or of an unknown kind', () => {
    const events = [event(FROM - 1, 'alarm', 'early'), event(TO + 1, 'note', 'late'), event(Number.NaN, 'note', 'no time'), event(FROM + 1, 'weather' as HistoryEvent['kind'], 'odd')];
    expect(placeMarks(events, FROM, TO)).toEqual([]);
  });

  it('gives every kind its own shape and word', () => {
    const looks = Object.values(MARK_LOOK);
    expect(new Set(looks.map((l) => l.icon)).size).toBe(looks.length);
    expect(new Set(looks.map((l) => l.label)).size).toBe(looks.length);
  });
});
