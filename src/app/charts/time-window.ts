/** A chart time window the user can choose. */
export interface TimeWindow {
  seconds: number;
  label: string;
}

export const TIME_WINDOWS: readonly TimeWindow[] = [
  { seconds: 30, label: '30 s' },
  { seconds: 60, label: '60 s' },
  { seconds: 300, label: '5 min' },
  { seconds: 900, label: '15 min' },
  { seconds: 3600, label: '1 h' },
];

export const DEFAULT_WINDOW_SECONDS = 60;

/**
 * Points kept per chart line over a whole window. About the pixel width of a wide chart: more
 * points than pixels draw nothing new but cost time on every frame.
 */
export const POINTS_PER_WINDOW = 3000;

/** Shortest spacing between kept samples for a window, ms (the window spread over `POINTS_PER_WINDOW`). */
export function sampleSpacingMs(windowSeconds: number): number {
  return (windowSeconds * 1000) / POINTS_PER_WINDOW;
}
