import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { RouterLink } from '@angular/router';

/** Screens a rationale may name, and where each lives for a channel. */
const SCREENS: { name: string; link: (channel: string) => string[] }[] = [
  { name: 'Coil detail', link: (channel) => ['/coils', /\.(x|y|z)$/.exec(channel)?.[1] ?? 'x'] },
  { name: 'Orientation map', link: () => ['/map'] },
  { name: 'Interlocks', link: () => ['/interlocks'] },
];
const PATTERN = new RegExp(`(${SCREENS.map((s) => s.name).join('|')})`);

/**
 * A rationale text (cause, consequence, action) with the screens it names turned into links:
 * "compare voltage and current on Coil detail" opens the Coil detail of the alarm's own pair.
 */
@Component({
  selector: 'tw-rationale-text',
  imports: [RouterLink],
  template: `@for (part of parts(); track $index) {@if (part.link) {<a [routerLink]="part.link">{{ part.text }}</a>} @else {{{ part.text }}}}`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RationaleText {
  readonly text = input.required<string>();
  /** The alarm's channel, e.g. `currentDeviation.y`: links go to that pair. */
  readonly channel = input.required<string>();

  protected readonly parts = computed(() =>
    this.text()
      .split(PATTERN)
      .filter((t) => t !== '')
      .map((t) => {
        const screen = SCREENS.find((s) => s.name === t);
        return { text: t, link: screen ? screen.link(this.channel()) : null };
      }),
  );
}
