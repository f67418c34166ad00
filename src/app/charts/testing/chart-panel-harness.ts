import { ComponentHarness, HarnessPredicate, type BaseHarnessFilters } from '@angular/cdk/testing';

export interface ChartPanelHarnessFilters extends BaseHarnessFilters {
  caption?: string | RegExp;
}

/** Talks to a `tw-chart-panel` in terms of what it shows: caption, legend, staleness. */
export class ChartPanelHarness extends ComponentHarness {
  static hostSelector = 'tw-chart-panel';

  static with(options: ChartPanelHarnessFilters = {}): HarnessPredicate<ChartPanelHarness> {
    return new HarnessPredicate(ChartPanelHarness, options).addOption('caption', options.caption, (harness, caption) =>
      HarnessPredicate.stringMatches(harness.getCaption(), caption),
    );
  }

  async getCaption(): Promise<string> {
    return (await this.locatorFor('figcaption .caption')()).text();
  }

  /** The stale note beside the caption; null while the data is current. */
  async getStaleNote(): Promise<string | null> {
    const note = await this.locatorForOptional('.stale-note')();
    return note ? (await note.text()).replace(/^history/, '').trim() : null;
  }

  /** Legend entries of the drawn lines (the time entry left out). */
  async getLineLabels(): Promise<string[]> {
    const labels = await this.locatorForAll('.u-legend .u-series th')();
    const texts = await Promise.all(labels.map((label) => label.text()));
    return texts.slice(1).map((text) => text.trim());
  }

  /** True while a chart is drawn (a canvas exists). */
  async isDrawn(): Promise<boolean> {
    return (await this.locatorForOptional('canvas')()) !== null;
  }
}
