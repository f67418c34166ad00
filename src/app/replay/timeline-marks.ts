import { formatLocalTime } from '../readout/format-quantity';
import type { HistoryEvent, HistoryEventKind } from '../../../shared/history/history-api';

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
  step: { icon: 'start', label: 'Run step' },
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
  /** Spoken and shown text: local time and the event's own line, e.g. "Note at 21:04:13 — Logbook: θ scan started". */
  text: string;
}

/**
 * Places the events inside [fromMs, toMs] along the timeline, oldest first; events of unknown
 * kind or time, or outside the window, are left out.
 */
export function placeMarks(events: readonly HistoryEvent[], fromMs: number, toMs: number): TimelineMark[] {
  const span = toMs - fromMs;
  if (!(span > 0)) return [];
  return events
    .map((event) => ({ event, timeMs: event.t, look: MARK_LOOK[event.kind] }))
    .filter(({ timeMs, look }) => look !== undefined && Number.isFinite(timeMs) && timeMs >= fromMs && timeMs <= toMs)
    .sort((a, b) => a.timeMs - b.timeMs)
    .map(({ event, timeMs, look }) => ({
      kind: event.kind,
      timeMs,
      percent: ((timeMs - fromMs) / span) * 100,
      icon: look.icon,
      text: `${look.label} at ${formatLocalTime(timeMs)} — ${event.label.trim() || look.label}${outcome(event)}`,
    }));
}

/** A run step's mark also says how the step ended ("Done after 1.0 s"); other marks keep to their line. */
function outcome(event: HistoryEvent): string {
  return event.kind === 'step' && event.detail ? `. ${event.detail}` : '';
}
