import { describe, expect, it } from 'vitest';
import { colorOf, isCollapsed, niceTicks, paletteColor, scaleFor } from './color-scale';

/** Relative luminance of an sRGB colour (WCAG 2.x definition, IEC 61966-2-1 transfer). */
function luminance([r, g, b]: number[]): number {
  const lin = (c: number) => {
    const x = c / 255;
    return x <= 0.04045 ? x / 12.92 : ((x + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

describe('paletteColor', () => {
  it('grows steadily lighter from the low end to the high end, so the order survives greyscale', () => {
    const l = Array.from({ length: 51 }, (_, k) => luminance(paletteColor(k / 50)));
    for (let k = 1; k < l.length; k++) expect(l[k]).toBeGreaterThan(l[k - 1]);
    // Ends far apart: dark against light (contrast ratio above 7:1, WCAG 2.x definition).
    expect((l[50] + 0.05) / (l[0] + 0.05)).toBeGreaterThan(7);
  });

  it('clamps positions outside 0…1 to the ends', () => {
    expect(paletteColor(-3)).toEqual(paletteColor(0));
    expect(paletteColor(7)).toEqual(paletteColor(1));
  });
});

describe('colour scale', () => {
  it('spans the stable values only and maps the ends to the palette ends', () => {
    const scale = scaleFor([1.021, Number.NaN, 1.019, 1.02], 'fermiSurfaceAspect');
    expect(scale.min).toBe(1.019);
    expect(scale.max).toBe(1.021);
    expect(colorOf(1.019, 'fermiSurfaceAspect', scale)).toEqual(paletteColor(0));
    expect(colorOf(1.021, 'fermiSurfaceAspect', scale)).toEqual(paletteColor(1));
  });

  it('gives no colour (hatch) where the gas collapses: NaN, or a collapse ratio of 1 or more', () => {
    const scale = scaleFor([0.2, 0.5, 1.3], 'collapseRatio');
    expect(scale.max).toBe(0.5);
    expect(colorOf(Number.NaN, 'tofAspect', scale)).toBeNull();
    expect(colorOf(1.3, 'collapseRatio', scale)).toBeNull();
    expect(isCollapsed(1, 'collapseRatio')).toBe(true);
    expect(isCollapsed(1.3, 'tofAspect')).toBe(false);
  });

  it('puts round ticks inside the range with the decimals their step needs', () => {
    expect(niceTicks(1.0191, 1.0214, 5)).toEqual({ ticks: [1.0195, 1.02, 1.0205, 1.021], digits: 4 });
    expect(niceTicks(0, 1, 5)).toEqual({ ticks: [0, 0.2, 0.4, 0.6, 0.8, 1], digits: 1 });
  });

  it('gives a map that does not change with direction a single tick', () => {
    expect(scaleFor([1.5, 1.5], 'tofAspect').ticks).toEqual([1.5]);
  });
});
