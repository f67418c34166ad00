/**
 * Keeps the keyboard on an alarm while a request about it changes its row: the row (an element
 * with `data-alarm-id` and `tabindex="-1"`) takes the focus before its button goes away, and
 * again once the list has been drawn anew. Without a row to hold it (the alarm left the list),
 * the focus stays where it is.
 */
export async function keepFocusOnAlarm(host: HTMLElement, id: string, request: () => Promise<void>): Promise<void> {
  const row = () => [...host.querySelectorAll<HTMLElement>('[data-alarm-id]')].find((el) => el.dataset['alarmId'] === id);
  row()?.focus();
  try {
    await request();
  } finally {
    // After the next drawing of the list the row may be a new element.
    setTimeout(() => {
      const active = host.ownerDocument.activeElement;
      if (active === null || active === host.ownerDocument.body || !host.contains(active)) row()?.focus();
    });
  }
}
