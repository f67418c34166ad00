import type { MapQuantity } from '../../../shared/physics/orientation-map';

/** An sRGB colour, channels 0…255. */
export type Rgb = [number, number, number];

/**
 * Anchors of the map palette in OKLCh (lightness 0…1, chroma, hue in degrees): deep indigo,
 * slate teal, sage, pale straw. Lightness rises steadily from end to end, so the order of the
 * colours reads the same in greyscale and with the common colour-vision deficiencies; the
 * hues avoid the alarm amber and trip red. Between anchors the palette is interpolated in
 * OKLab (Ottosson 2020, "A perceptual color space for image processing"), where equal steps
 * look like equal steps.
 */
const ANCHORS: readonly [number, number, number][] = [
  [0.27, 0.09, 280],
  [0.49, 0.09, 230],
  [0.7, 0.1, 165],
  [0.93, 0.085, 100],
];

/** Colour scale of a map: value range, ticks, and the decimals the ticks need. */
export interface ColorScale {
  min: number;
  max: number;
  ticks: number[];
  digits: number;
}

/** Quantity names and units for the legend and readouts. */
export const QUANTITY_TEXT: Record<MapQuantity, { name: string; symbol: string; unit: string }> = {
  fermiSurfaceAspect: { name: 'Fermi-surface aspect ratio', symbol: 'β = K∥/K⊥', unit: 'dimensionless' },
  tofAspect: { name: 'TOF aspect ratio', symbol: 'major/minor', unit: 'dimensionless' },
  collapseRatio: { name: 'Collapse ratio', symbol: 'ε_dd/ε_dd,crit', unit: 'collapse at 1' },
};

/**
 * True where the map has no stable gas: NaN (no stationary state), or a collapse ratio of 1 or
 * more (ε_dd at or beyond the critical value for that direction).
 */
export function isCollapsed(value: number, quantity: MapQuantity): boolean {
  return Number.isNaN(value) || (quantity === 'collapseRatio' && value >= 1);
}

/** Palette colour at position `t` (0 = low end, 1 = high end; clamped). */
export function paletteColor(t: number): Rgb {
  const x = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (ANCHORS.length - 1);
  const i = Math.min(ANCHORS.length - 2, Math.floor(x));
  const f = x - i;
  const a = oklab(ANCHORS[i]);
  const b = oklab(ANCHORS[i + 1]);
  return oklabToSrgb(a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2]));
}

/** The colour of a map value, or null where the gas is collapsed (drawn hatched). */
export function colorOf(value: number, quantity: MapQuantity, scale: ColorScale): Rgb | null {
  if (isCollapsed(value, quantity)) return null;
  const span = scale.max - scale.min;
  return paletteColor(span > 0 ? (value - scale.min) / span : 0.5);
}

/** The scale spanning a map's stable values, with round ticks. */
export function scaleFor(values: ArrayLike<number>, quantity: MapQuantity): ColorScale {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (isCollapsed(v, quantity)) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (min > max) return { min: 0, max: 1, ticks: [], digits: 0 };
  if (max - min < 1e-9 * Math.max(1, Math.abs(max))) {
    // A map that does not change with direction: one colour, one tick.
    const digits = 4;
    return { min, max, ticks: [min], digits };
  }
  const { ticks, digits } = niceTicks(min, max, 5);
  return { min, max, ticks, digits };
}

/**
 * Round tick values inside [min, max], about `target` of them, with a step of 1, 2 or 5 times a
 * power of ten (common practice for chart axes), and the decimals that step needs.
 */
export function niceTicks(min: number, max: number, target: number): { ticks: number[]; digits: number } {
  const raw = (max - min) / Math.max(1, target);
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  const digits = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const ticks: number[] = [];
  for (let k = Math.ceil(min / step - 1e-9); k * step <= max + 1e-9 * step; k++) ticks.push(Number((k * step).toFixed(digits)));
  return { ticks, digits };
}

/** CSS `linear-gradient` stops of the palette, low end at the left. */
export function paletteGradient(stops = 16): string {
  const colors = Array.from({ length: stops + 1 }, (_, k) => {
    const [r, g, b] = paletteColor(k / stops);
    return `rgb(${r} ${g} ${b}) ${((100 * k) / stops).toFixed(1)}%`;
  });
  return `linear-gradient(to right, ${colors.join(', ')})`;
}

function oklab([l, c, hDeg]: readonly [number, number, number]): [number, number, number] {
  const h = (hDeg * Math.PI) / 180;
  return [l, c * Math.cos(h), c * Math.sin(h)];
}

/** OKLab → sRGB (Ottosson 2020, matrices as published there), clipped into the gamut. */
function oklabToSrgb(l: number, a: number, b: number): Rgb {
  const l_ = (l + 0.3963377774 * a + 0.2158037573 * b) ** 3;
  const m_ = (l - 0.1055613458 * a - 0.0638541728 * b) ** 3;
  const s_ = (l - 0.0894841775 * a - 1.291485548 * b) ** 3;
  const linear = [
    4.0767416621 * l_ - 3.3077115913 * m_ + 0.2309699292 * s_,
    -1.2684380046 * l_ + 2.6097574011 * m_ - 0.3413193965 * s_,
    -0.0041960863 * l_ - 0.7034186147 * m_ + 1.707614701 * s_,
  ];
  return linear.map((c) => {
    const x = Math.min(1, Math.max(0, c));
    // sRGB transfer function (IEC 61966-2-1).
    const encoded = x <= 0.0031308 ? 12.92 * x : 1.055 * x ** (1 / 2.4) - 0.055;
    return Math.round(255 * encoded);
  }) as Rgb;
}
