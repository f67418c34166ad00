import { readlinkSync } from 'node:fs';
import { setPriority } from 'node:os';

/** Nice value of the background threads (0 is the default, 19 the lowest priority). */
export const BACKGROUND_NICE = 10;

/**
 * Lowers the scheduling priority of the calling thread only (a worker thread), so that when
 * the machine is short of CPU the event loop that ingests, supervises and fans out runs first
 * and the background work (storage, prediction) takes what is left. On Linux every thread has
 * its own nice value, set through its thread id (`/proc/thread-self`); elsewhere, or where the
 * call is refused, the thread keeps its priority. Returns the thread id lowered, or null.
 */
export function lowerThisThreadPriority(nice = BACKGROUND_NICE): number | null {
  try {
    const tid = Number(readlinkSync('/proc/thread-self').split('/').pop());
    if (!Number.isInteger(tid) || tid <= 0) return null;
    setPriority(tid, nice);
    return tid;
  } catch {
    return null;
  }
}
