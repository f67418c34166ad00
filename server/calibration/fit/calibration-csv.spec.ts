import { describe, expect, it } from 'vitest';
import { parseCalibrationCsv } from './calibration-csv.js';
import { fitCalibration } from './calibration-fit.js';

const HEADER = 'current_x_A,current_y_A,current_z_A,field_G';

/** A CSV whose lines after the header are `rows`. */
const csv = (header: string, rows: string[]) => [header, ...rows].join('\n');
const fit = (text: string, mhzPerGauss?: number) => fitCalibration(parseCalibrationCsv(text, { mhzPerGauss }));

/** Rows where every pair runs, with |B| from K = 1.2·identity and no offset (invented). */
function goodRows(count: number): string[] {
  return Array.from({ length: count }, (_, n) => {
    const i = [Math.sin(n + 1) * 5, Math.cos(2 * n + 1) * 5, Math.sin(3 * n + 2) * 5];
    return `${i.join(',')},${1.2 * Math.hypot(...i)}`;
  });
}

describe('calibration file', () => {
  it('reads |B|, frequency and vector files with comments, blank lines and a byte-order mark', () => {
    const text = `\ufeff# Lindqvist Hall, invented\n${HEADER},sigma_G\n\n1,2,3,4.5,0.01\n`;
    const data = parseCalibrationCsv(text);
    expect(data).toEqual({ kind: 'magnitude', source: 'field', points: [{ line: 4, currentA: [1, 2, 3], fieldGauss: 4.5, sigmaGauss: 0.01 }] });
    const freq = parseCalibrationCsv('current_x_A,current_y_A,current_z_A,frequency_MHz,sigma_MHz\n1,2,3,2.8,0.014', { mhzPerGauss: 1.4 });
    expect(freq.points[0]).toMatchObject({ fieldGauss: 2, sigmaGauss: 0.01 });
    const vector = parseCalibrationCsv('current_x_A,current_y_A,current_z_A,field_x_G,field_y_G,field_z_G\n1,2,3,0.1,-0.2,3e-1');
    expect(vector).toEqual({ kind: 'vector', points: [{ line: 2, currentA: [1, 2, 3], fieldGauss: [0.1, -0.2, 0.3] }] });
  });

  it.each([
    ['a non-numeric cell', csv(HEADER, ['1,2,3,4', '1,2,x,4']), /^line 3, column current_z_A: "x" is not a number/],
    ['an empty cell', csv(HEADER, ['1,2,,4']), /^line 2, column current_z_A: "" is not a number/],
    ['a missing column', 'current_x_A,current_y_A,field_G\n1,2,3', /^line 1: column current_z_A is missing/],
    ['an unknown column', `${HEADER},temp_C\n1,2,3,4,5`, /^line 1, column 5: "temp_C" is not a calibration column/],
    ['a short line', csv(HEADER, ['1,2,3,4', '1,2,3']), /^line 3: 3 cells, but the header has 4 columns/],
    ['an absurd number', csv(HEADER, ['1e308,2,3,4']), /^line 2, column current_x_A: 1e308 is out of range/],
    ['a negative |B|', csv(HEADER, ['1,2,3,-4']), /^line 2, column field_G: -4 must not be negative/],
    ['a zero sigma', csv(`${HEADER},sigma_G`, ['1,2,3,4,0']), /^line 2, column sigma_G: 0 must be positive/],
    ['a NUL character', csv(HEADER, ['1,2,3\u0000,4']), /NUL character/],
    // csv-parse decodes the text as UTF-8, so a lone surrogate arrives as U+FFFD.
    ['a lone surrogate', csv(HEADER, ['1,2,\ud800,4']), /^line 2, column current_z_A: "\ufffd" is not a number/],
    ['no field column', 'current_x_A,current_y_A,current_z_A\n1,2,3', /^line 1: no field column/],
    ['both field and frequency', `${HEADER},frequency_MHz\n1,2,3,4,5`, /not both/],
    ['an incomplete vector file', 'current_x_A,current_y_A,current_z_A,field_x_G,field_y_G\n1,2,3,4,5', /field_z_G is missing/],
  ])('refuses %s naming the line and column', (_what, text, message) => {
    expect(() => parseCalibrationCsv(text)).toThrow(message);
  });

  it('refuses a frequency file without a positive Zeeman coefficient, and a coefficient for a field file', () => {
    const text = csv('current_x_A,current_y_A,current_z_A,frequency_MHz', ['1,2,3,4']);
    expect(() => parseCalibrationCsv(text)).toThrow(/needs the transition's linear Zeeman coefficient/);
    expect(() => parseCalibrationCsv(text, { mhzPerGauss: 0 })).toThrow(/must be a positive number of MHz\/G; got 0/);
    expect(() => parseCalibrationCsv(text, { mhzPerGauss: -1.4 })).toThrow(/got -1.4/);
    expect(() => parseCalibrationCsv(csv(HEADER, ['1,2,3,4']), { mhzPerGauss: 1.4 })).toThrow(/leave the MHz per G coefficient out/);
  });

  it('refuses fewer points than parameters', () => {
    expect(() => fit(csv(HEADER, goodRows(9)))).toThrow(/needs at least 10 data lines .* the file has 9/);
    expect(() => fit(csv('current_x_A,current_y_A,current_z_A,field_x_G,field_y_G,field_z_G', ['1,2,3,1,2,3', '2,1,3,2,1,3', '3,2,1,3,2,1', '0,0,1,0,0,1'])))
      .toThrow(/needs at least 5 data lines .* the file has 4/);
    expect(fit(csv(HEADER, goodRows(10))).report.points).toBe(10);
  });

  it('refuses currents that do not determine every parameter, saying which pair', () => {
    const only = (axis: number) => Array.from({ length: 12 }, (_, n) => {
      const i = [0, 0, 0];
      i[axis] = n - 5.5;
      return `${i.join(',')},${Math.abs(1.2 * i[axis]) + 0.1}`;
    });
    expect(() => fit(csv(HEADER, only(1)))).toThrow(/^only the y pair ever moves \(current_x_A and current_z_A never change\)/);
    const noZ = goodRows(15).map((row) => row.split(',').map((v, i) => (i === 2 ? '1.5' : v)).join(','));
    expect(() => fit(csv(HEADER, noZ))).toThrow(/^column current_z_A: the z pair never moves/);
    // Each pair alone, one at a time: the angles between the pair fields stay open.
    const oneAtATime = [0, 1, 2].flatMap((axis) => only(axis).slice(0, 5));
    expect(() => fit(csv(HEADER, oneAtATime))).toThrow(/pairs never run together at independent currents/);
    // Vector file where y always runs at twice x.
    const locked = Array.from({ length: 8 }, (_, n) => `${n},${2 * n},${(n * 7) % 5},1,2,3`);
    expect(() => fit(csv('current_x_A,current_y_A,current_z_A,field_x_G,field_y_G,field_z_G', locked))).toThrow(/current_x_A and current_y_A only ever move in a fixed proportion/);
  });
});
