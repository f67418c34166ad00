import { readFileSync } from 'node:fs';

/**
 * An identity for a running process that survives PID reuse: the boot id of the kernel and the
 * process's start time in clock ticks since boot (`/proc/PID/stat` field 22). Two processes
 * that ever had the same PID on one boot have different start times; a container restarted on
 * the same kernel gets a new start time for its PID 1. Null where `/proc` is unavailable
 * (not Linux) or the process does not exist.
 */
export function processIdentity(pid: number): string | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // The command name (field 2) is in parentheses and may contain spaces: count from its end.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    const startTicks = fields[19];
    if (startTicks === undefined || !/^\d+$/.test(startTicks)) return null;
    return `${bootId()}:${startTicks}`;
  } catch {
    return null;
  }
}

function bootId(): string {
  try {
    return readFileSync('/proc/sys/kernel/random/boot_id', 'utf8').trim();
  } catch {
    return 'unknown-boot';
  }
}

/** Whether a process with this PID exists now (any owner). */
export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}
