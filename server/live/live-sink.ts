import type { SeriesChunk, SlowChunk } from '../../shared/live/live-state.js';

/**
 * Where the live state's changes go (the WebSocket fan-out): chart points of the fast and slow
 * channels, and changes of the live state that bring no chart points (a controller status, a
 * new prediction). Each method says what happened; the receiver reads the state it sends.
 */
export interface LiveSink {
  publishSeries(series: SeriesChunk): void;
  publishSlow(slow: SlowChunk): void;
  /** The live state changed without new chart points. */
  publishStateChange(): void;
}
