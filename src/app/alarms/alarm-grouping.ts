/** One root alarm with the alarms its fault raised afterwards (first-out grouping, ISA-18.2). */
export interface AlarmGroup<T> {
  head: T;
  /** Alarms grouped under `head`, in the order given. */
  members: T[];
}

/**
 * Folds alarms under their first-out alarm. An alarm whose `firstOutOf` names an alarm in the
 * list goes under it; one whose root is no longer in the list (already cleared and
 * acknowledged) stands on its own, so nothing active is ever hidden. Groups keep the order
 * given (the server lists high priority first, then by the time the condition began); the
 * members of a group are ordered by the time their condition began, as the fault spread.
 */
export function groupByFirstOut<T extends { id: string; firstOutOf?: string; conditionSince?: string | null }>(alarms: readonly T[]): AlarmGroup<T>[] {
  const ids = new Set(alarms.map((a) => a.id));
  const groups = new Map<string, AlarmGroup<T>>();
  const order: AlarmGroup<T>[] = [];
  for (const alarm of alarms) {
    if (alarm.firstOutOf && alarm.firstOutOf !== alarm.id && ids.has(alarm.firstOutOf)) continue;
    const group = { head: alarm, members: [] };
    groups.set(alarm.id, group);
    order.push(group);
  }
  for (const alarm of alarms) {
    if (!alarm.firstOutOf || alarm.firstOutOf === alarm.id) continue;
    groups.get(alarm.firstOutOf)?.members.push(alarm);
  }
  const since = (a: T) => (a.conditionSince ? Date.parse(a.conditionSince) : Infinity);
  for (const group of order) group.members.sort((a, b) => since(a) - since(b));
  return order;
}
