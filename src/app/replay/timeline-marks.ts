import { formatLocalTime } from '../readout/format-quantity';
import type { HistoryEvent, HistoryEventKind } from './history-api';

/** How a kind of event looks on the timeline: a Material Symbols icon (its own shape) and a word. */
export interface MarkLook {
  icon: string;
  label: string;
}

/** Each kind has a shape of its own and a word in the legend; colour is not needed to tell them apart. */
export const MARK_LOOK: Record<HistoryEventKind, MarkLook> = {
  alarm: { icon: 'warning', label: 'Alarm' },
  trip: { icon: 'report', label: 'Trip' },
  reset: { icon: 'restart_alt', label: 'Reset' },
  note: { icon: 'sticky_note_2', label: 'Note' },
  shot: { icon: 'photo_camera', label: 'Shot' },
  steer: { icon: 'navigation', label: 'Steering command' },
  run: { icon: 'flag', label: 'Run' },
  calibration: { icon: 'tune', label: 'Calibration' },
  profile: { icon: 'science', label: 'Sample profile' },
};

/** A mark on the timeline. */
export interface TimelineMark {
  kind: HistoryEventKind;
  timeMs: number;
  /** Position along the timeline, 0 (window start) to 100 (window end). */
  percent: number;
  icon: string;
  /** Spoken and shown text, e.g. "Alarm 21:04:13: X coil temperature high". */
  text: string;
}

/** Fields of an event that may carry its text, in the order they are tried. */
const TEXT_FIELDS = ['label', 'text', 'title', 'message', 'summary', 'name', 'reason'];

/** Unix epoch ms of an event's `at` (ISO text or a number); NaN when unreadable. */
export function eventTimeMs(event: HistoryEvent): number {
  return typeof event.at === 'number' ? event.at : Date.parse(event.at);
}

/** The event's own words, if it has any. */
export function eventDetail(event: HistoryEvent): string | null {
  for (const key of TEXT_FIELDS) {
    const value = event[key];
    if (typeof value === 'string' && value.trim()) return value.trim();
  }
  return null;
}

/**
 * Places the events inside [fromMs, toMs] along the timeline, oldest first; events of unknown
 * kind or time, or outside the window, are left out.
 */
export function placeMarks(events: readonly HistoryEvent[], fromMs: number, toMs: number): TimelineMark[] {
  const span = toMs - fromMs;
  if (!(span > 0)) return [];
  return events
    .map((event) => ({ event, timeMs: eventTimeMs(event), look: MARK_LOOK[event.kind] }))
    .filter(({ timeMs, look }) => look !== undefined && timeMs >= fromMs && timeMs <= toMs)
    .sort((a, b) => a.timeMs - b.timeMs)
    .map(({ event, timeMs, look }) => {
      const detail = eventDetail(event);
      return {
        kind: event.kind,
        timeMs,
        percent: ((timeMs - fromMs) / span) * 100,
        icon: look.icon,
        text: `${look.label} ${formatLocalTime(timeMs)}${detail ? `: ${detail}` : ''}`,
      };
    });
}
