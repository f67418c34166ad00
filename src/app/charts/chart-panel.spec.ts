import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { beforeEach, describe, expect, it } from 'vitest';
import { ChartPanel, type ChartAxis, type ChartLine } from './chart-panel';
import { RingBuffer } from './ring-buffer';
import { ChartPanelHarness } from './testing/chart-panel-harness';

const LINES: ChartLine[] = [
  { label: 'Ix (A)', column: 0, scale: 'A', color: '--tw-series-1', digits: 3 },
  { label: 'Iy (A)', column: 1, scale: 'A', color: '--tw-series-2', dash: [7, 4], digits: 3 },
];
const AXES: ChartAxis[] = [{ scale: 'A', label: 'Current (A)', side: 'left' }];

describe('ChartPanel', () => {
  let fixture: ComponentFixture<ChartPanel>;
  let chart: ChartPanelHarness;

  beforeEach(async () => {
    const buffer = new RingBuffer(16, 2);
    for (let i = 0; i < 10; i++) buffer.push(1_700_000_000_000 + 10 * i, [i, -i]);
    fixture = TestBed.createComponent(ChartPanel);
    fixture.componentRef.setInput('caption', 'Coil currents');
    fixture.componentRef.setInput('buffer', buffer);
    fixture.componentRef.setInput('lines', LINES);
    fixture.componentRef.setInput('axes', AXES);
    fixture.componentRef.setInput('windowSeconds', 60);
    await fixture.whenStable();
    chart = await TestbedHarnessEnvironment.harnessForFixture(fixture, ChartPanelHarness);
  });

  it('draws a chart with its caption and one legend entry per line', async () => {
    expect(await chart.getCaption()).toBe('Coil currents');
    expect(await chart.isDrawn()).toBe(true);
    expect(await chart.getLineLabels()).toEqual(['Ix (A)', 'Iy (A)']);
  });

  it('shows a stale note beside the caption while the data is not current', async () => {
    expect(await chart.getStaleNote()).toBeNull();
    fixture.componentRef.setInput('staleNote', 'Stale since 21:04:13');
    expect(await chart.getStaleNote()).toBe('Stale since 21:04:13');
  });

  it('removes its chart when destroyed', async () => {
    const host = fixture.nativeElement as HTMLElement;
    fixture.destroy();
    expect(host.querySelector('canvas')).toBeNull();
  });
});
