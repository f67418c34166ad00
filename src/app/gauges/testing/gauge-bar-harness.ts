import { ComponentHarness, HarnessPredicate, type BaseHarnessFilters } from '@angular/cdk/testing';
import type { ReadingLevel } from '../gauge-scale';

export interface GaugeBarHarnessFilters extends BaseHarnessFilters {
  /** The gauge's accessible name, e.g. "X current". */
  label?: string | RegExp;
}

/** Talks to a `tw-gauge-bar` in terms of what it shows, not how its DOM is built. */
export class GaugeBarHarness extends ComponentHarness {
  static hostSelector = 'tw-gauge-bar';

  static with(options: GaugeBarHarnessFilters = {}): HarnessPredicate<GaugeBarHarness> {
    return new HarnessPredicate(GaugeBarHarness, options).addOption('label', options.label, (harness, label) =>
      HarnessPredicate.stringMatches(harness.getLabel(), label),
    );
  }

  private readonly needle = this.locatorForOptional('.needle');
  private readonly normalBand = this.locatorFor('.normal');
  private readonly marks = this.locatorForAll('.mark');
  private readonly setpointMarker = this.locatorForOptional('.setpoint');
  private readonly statusText = this.locatorForOptional('.status-text');

  async getLabel(): Promise<string> {
    return (await (await this.host()).getAttribute('aria-label')) ?? '';
  }

  /** The value as displayed, with its unit. */
  async getValueText(): Promise<string> {
    return (await this.locatorFor('.value')()).text();
  }

  /** Everything a screen reader announces for the value. */
  async getSpokenValue(): Promise<string> {
    return (await (await this.host()).getAttribute('aria-valuetext')) ?? '';
  }

  /** Where the value sits along the scale, 0…100 %; null when there is no value. */
  async getValuePercent(): Promise<number | null> {
    return percentOf(await this.needle());
  }

  async getNormalBandPercent(): Promise<{ from: number; to: number }> {
    const band = await this.normalBand();
    return { from: Number(await band.getAttribute('data-from')), to: Number(await band.getAttribute('data-to')) };
  }

  async getLevelMarks(): Promise<{ kind: 'alarm' | 'trip'; percent: number }[]> {
    const marks = await this.marks();
    return Promise.all(
      marks.map(async (mark) => ({
        kind: (await mark.getAttribute('data-kind')) as 'alarm' | 'trip',
        percent: Number(await mark.getAttribute('data-percent')),
      })),
    );
  }

  async getSetpointPercent(): Promise<number | null> {
    return percentOf(await this.setpointMarker());
  }

  async getLevel(): Promise<ReadingLevel> {
    return (await (await this.host()).getAttribute('data-level')) as ReadingLevel;
  }

  /** The words shown beside an abnormal or missing reading; null when normal. */
  async getStatusText(): Promise<string | null> {
    const status = await this.statusText();
    return status ? (await status.text()).trim() : null;
  }

  /** The icon ligature shown with the status; null when none. */
  async getStatusIcon(): Promise<string | null> {
    const icon = await this.locatorForOptional('.status mat-icon')();
    return icon ? (await icon.text()).trim() : null;
  }

  async isStale(): Promise<boolean> {
    return (await this.host()).hasClass('stale');
  }
}

async function percentOf(element: { getAttribute(name: string): Promise<string | null> } | null): Promise<number | null> {
  if (!element) return null;
  const value = await element.getAttribute('data-percent');
  return value === null ? null : Number(value);
}
