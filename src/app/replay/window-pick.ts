/** Length of the window offered first, ms: the last ten minutes. */
export const DEFAULT_WINDOW_MS = 10 * 60_000;

/** A window as the form holds it: a calendar day and a local wall-clock time for each end. */
export interface WindowForm {
  fromDate: Date | null;
  fromTime: string;
  toDate: Date | null;
  toTime: string;
}

/** The form for the `lengthMs` before `nowMs`, in local time to the second. */
export function windowBefore(nowMs: number, lengthMs = DEFAULT_WINDOW_MS): WindowForm {
  const to = new Date(nowMs);
  const from = new Date(nowMs - lengthMs);
  return { fromDate: dayOf(from), fromTime: timeText(from), toDate: dayOf(to), toTime: timeText(to) };
}

/**
 * Reads the form: `{ fromMs, toMs }`, or the problem in words naming the field as the screen
 * labels it.
 */
export function readWindow(form: WindowForm): { fromMs: number; toMs: number } | { problem: string } {
  const fromMs = combine(form.fromDate, form.fromTime);
  if (typeof fromMs === 'string') return { problem: `From: ${fromMs}` };
  const toMs = combine(form.toDate, form.toTime);
  if (typeof toMs === 'string') return { problem: `To: ${toMs}` };
  if (toMs <= fromMs) return { problem: 'To must be later than From.' };
  return { fromMs, toMs };
}

/** Local date plus "hh:mm" or "hh:mm:ss", as Unix epoch ms; a sentence when either is unusable. */
function combine(date: Date | null, time: string): number | string {
  if (!date || Number.isNaN(date.getTime())) return 'choose a date.';
  const match = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/.exec(time.trim());
  if (!match) return 'enter the time as hh:mm:ss.';
  const [hours, minutes, seconds] = [Number(match[1]), Number(match[2]), Number(match[3] ?? 0)];
  if (hours > 23 || minutes > 59 || seconds > 59) return 'enter the time as hh:mm:ss.';
  return new Date(date.getFullYear(), date.getMonth(), date.getDate(), hours, minutes, seconds).getTime();
}

function dayOf(d: Date): Date {
  return new Date(d.getFullYear(), d.getMonth(), d.getDate());
}

function timeText(d: Date): string {
  return [d.getHours(), d.getMinutes(), d.getSeconds()].map((n) => String(n).padStart(2, '0')).join(':');
}
