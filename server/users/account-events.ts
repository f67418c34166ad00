/**
 * Tells whoever holds sessions (the WebSocket fan-out) that an account changed: disabled,
 * enabled, role or password changed. Listeners re-check the sessions of that account.
 */
export class AccountEvents {
  private readonly listeners = new Set<(userId: number) => void>();

  /** Registers `listener`; returns a function that removes it. */
  onChange(listener: (userId: number) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  changed(userId: number): void {
    for (const listener of this.listeners) listener(userId);
  }
}
