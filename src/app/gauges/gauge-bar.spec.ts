import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { beforeEach, describe, expect, it } from 'vitest';
import type { ChannelBand } from '../../../shared/live/channels';
import { GaugeBar } from './gauge-bar';
import { GaugeBarHarness } from './testing/gauge-bar-harness';

// Bands of our own making for the tests: a bipolar current and a low-limited flow.
const CURRENT: ChannelBand = {
  id: 'current', label: 'Current', unit: 'A', scale: [-20, 20], normal: [-10, 10],
  high: 15, low: null, tripHigh: 18, tripLow: null, absolute: true,
};
const FLOW: ChannelBand = {
  id: 'flow', label: 'Coolant flow', unit: 'L/min', scale: [0, 8], normal: [2, 6],
  high: null, low: 1.6, tripHigh: null, tripLow: 0.8, absolute: false,
};

describe('GaugeBar', () => {
  let fixture: ComponentFixture<GaugeBar>;
  let gauge: GaugeBarHarness;

  async function show(inputs: { band: ChannelBand; value: number | null; setpoint?: number | null; stale?: boolean; digits?: number }) {
    fixture.componentRef.setInput('label', `X ${inputs.band.label.toLowerCase()}`);
    fixture.componentRef.setInput('band', inputs.band);
    fixture.componentRef.setInput('value', inputs.value);
    fixture.componentRef.setInput('setpoint', inputs.setpoint ?? null);
    fixture.componentRef.setInput('stale', inputs.stale ?? false);
    fixture.componentRef.setInput('digits', inputs.digits ?? 1);
    await fixture.whenStable();
  }

  beforeEach(async () => {
    fixture = TestBed.createComponent(GaugeBar);
    await show({ band: CURRENT, value: 0 });
    gauge = await TestbedHarnessEnvironment.harnessForFixture(fixture, GaugeBarHarness);
  });

  it('places the value along the scale and shows it with its unit', async () => {
    await show({ band: CURRENT, value: 5, digits: 2 });
    expect(await gauge.getValuePercent()).toBe(62.5);
    expect(await gauge.getValueText()).toBe('5.00\u00a0A');
  });

  it('writes negative values with a true minus sign', async () => {
    await show({ band: CURRENT, value: -5 });
    expect(await gauge.getValueText()).toBe('\u22125.0\u00a0A');
    expect(await gauge.getValuePercent()).toBe(37.5);
  });

  it('pins a value beyond the scale at the end of the bar', async () => {
    await show({ band: FLOW, value: 9.5 });
    expect(await gauge.getValuePercent()).toBe(100);
  });

  it('shades the normal band between its limits', async () => {
    await show({ band: FLOW, value: 3 });
    expect(await gauge.getNormalBandPercent()).toEqual({ from: 25, to: 75 });
  });

  it('marks alarm and trip levels on both sides of zero for a bipolar channel', async () => {
    const marks = await gauge.getLevelMarks();
    expect(marks.sort((a, b) => a.percent - b.percent)).toEqual([
      { kind: 'trip', percent: 5 },
      { kind: 'alarm', percent: 12.5 },
      { kind: 'alarm', percent: 87.5 },
      { kind: 'trip', percent: 95 },
    ]);
  });

  it('shows a normal reading calmly, without status words or icon', async () => {
    await show({ band: CURRENT, value: 8 });
    expect(await gauge.getLevel()).toBe('normal');
    expect(await gauge.getStatusText()).toBeNull();
    expect(await gauge.getStatusIcon()).toBeNull();
  });

  it('marks a reading beyond the alarm level with words and an icon, whatever its sign', async () => {
    await show({ band: CURRENT, value: -16 });
    expect(await gauge.getLevel()).toBe('alarm');
    expect(await gauge.getStatusText()).toBe('High alarm');
    expect(await gauge.getStatusIcon()).toBe('warning');
  });

  it('marks a reading beyond the trip level as such, not merely as an alarm', async () => {
    await show({ band: FLOW, value: 0.5 });
    expect(await gauge.getLevel()).toBe('trip');
    expect(await gauge.getStatusText()).toBe('Below trip level');
  });

  it('says when a reading has left its normal band before it reaches an alarm level', async () => {
    await show({ band: FLOW, value: 1.8 });
    expect(await gauge.getLevel()).toBe('off-band');
    expect(await gauge.getStatusText()).toBe('Below normal band');
  });

  it('says "No data" and draws no value when the reading is missing', async () => {
    await show({ band: FLOW, value: null });
    expect(await gauge.getValueText()).toBe('—');
    expect(await gauge.getValuePercent()).toBeNull();
    expect(await gauge.getStatusText()).toBe('No data');
  });

  it('draws the setpoint as a marker and announces it with the value', async () => {
    await show({ band: CURRENT, value: 9.7, setpoint: 10 });
    expect(await gauge.getSetpointPercent()).toBe(75);
    expect(await gauge.getSpokenValue()).toBe('9.7\u00a0A, setpoint 10.0\u00a0A');
  });

  it('carries its values in its accessible name and value text, including staleness', async () => {
    await show({ band: CURRENT, value: 16, stale: true });
    expect(await gauge.getLabel()).toBe('X current');
    expect(await gauge.getSpokenValue()).toBe('16.0\u00a0A, High alarm, stale');
    expect(await gauge.isStale()).toBe(true);
  });
});
