import { Injectable, signal } from '@angular/core';

/**
 * Whether the Replay page is showing: the toolbar's connection indicator and the interlock
 * banner then say that they are about now, not about the replayed time.
 */
@Injectable({ providedIn: 'root' })
export class ReplayPresence {
  readonly active = signal(false);
}
