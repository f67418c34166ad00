/**
 * The used value of a colour custom property (canvas cannot read `var()` or `light-dark()`):
 * a probe element resolves it the way the page does.
 */
export function resolveColor(host: HTMLElement, property: string): string {
  const probe = document.createElement('span');
  probe.style.color = `var(${property})`;
  host.appendChild(probe);
  const color = getComputedStyle(probe).color;
  probe.remove();
  return color || 'gray';
}

/**
 * Canvas size for the host, px: its width, and the height from the `--tw-chart-height` custom
 * property (larger on wall screens). The legend sits below, outside this height.
 */
export function plotSize(host: HTMLElement): { width: number; height: number } {
  const height = parseFloat(getComputedStyle(host).getPropertyValue('--tw-chart-height'));
  return { width: Math.max(host.clientWidth, 200), height: Number.isFinite(height) && height > 0 ? height : 200 };
}

/** Canvas text does not follow CSS: a font sized from the root font, which grows on wall screens. */
export function chartFont(): { font: string; rem: number } {
  const rem = parseFloat(getComputedStyle(document.documentElement).fontSize) || 16;
  return { font: `${Math.round(0.75 * rem)}px Roboto, sans-serif`, rem };
}

/** Decimals that tell neighbouring tick values apart (2.5 → 1, 0.05 → 2, 10 → 0). */
export function decimalsFor(splits: number[]): number {
  const step = splits.length > 1 ? Math.abs(splits[1] - splits[0]) : 1;
  for (let decimals = 0; decimals < 4; decimals++) {
    const scaled = step * 10 ** decimals;
    if (Math.abs(scaled - Math.round(scaled)) < 1e-6 * Math.max(1, scaled)) return decimals;
  }
  return 4;
}
