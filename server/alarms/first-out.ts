/**
 * First-out grouping: one root fault (a cooling loss) raises a cascade of alarms — low flow,
 * then coil temperature high, then high-high, and the current deviations after the trip.
 * Alarms are grouped by the time their CONDITION began, not by when they were annunciated:
 * an alarm with a long on-delay is annunciated after the faster alarms its fault caused, but
 * it is still the first out. Every annunciated raise whose condition began within `windowMs`
 * of the group's first condition joins the group; one whose condition began earlier than the
 * present head takes the head over.
 *
 * The window runs from the group's earliest condition start (not from the latest raise), so a
 * long chain of faults cannot keep one group open for ever; and a group whose conditions have
 * all cleared is closed (`close()`), so a new fault is not filed under an old, finished one.
 */
export const DEFAULT_FIRST_OUT_WINDOW_MS = 10_000;

/** Where a raise belongs. */
export interface FirstOutAssignment {
  /** The first-out alarm this raise is grouped under; null when it is the first out itself. */
  head: string | null;
  /** Set when this raise took the head over: the former head, whose group now belongs to it. */
  replaced?: string;
}

export class FirstOutGrouper {
  private group: { headId: string; since: number } | null = null;

  /** @param windowMs how far apart condition starts may lie within one group, ms. */
  constructor(readonly windowMs: number = DEFAULT_FIRST_OUT_WINDOW_MS) {
    if (!(windowMs > 0)) throw new Error(`first-out window must be more than 0 ms, got ${windowMs}`);
  }

  /** The head of the open group, or null. */
  head(): string | null {
    return this.group?.headId ?? null;
  }

  /** Closes the open group: the next raise opens a new one. */
  close(): void {
    this.group = null;
  }

  /**
   * Registers an annunciated raise of `alarmId` whose condition began at `conditionSinceMs`
   * (Unix epoch ms, before any on-delay). Equal starts keep the head already chosen.
   */
  assign(alarmId: string, conditionSinceMs: number): FirstOutAssignment {
    const group = this.group;
    if (!group || conditionSinceMs > group.since + this.windowMs) {
      this.group = { headId: alarmId, since: conditionSinceMs };
      return { head: null };
    }
    if (group.headId === alarmId) {
      group.since = Math.min(group.since, conditionSinceMs);
      return { head: null };
    }
    if (conditionSinceMs < group.since - this.windowMs) return { head: null };
    if (conditionSinceMs < group.since) {
      const replaced = group.headId;
      this.group = { headId: alarmId, since: conditionSinceMs };
      return { head: null, replaced };
    }
    return { head: group.headId };
  }
}
