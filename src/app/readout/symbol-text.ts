import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

/** Symbols written with an underscore in plain strings, and how they are typeset. */
const SYMBOLS: readonly { plain: string; base: string; sub: string }[] = [
  { plain: 'ε_dd,crit', base: 'ε', sub: 'dd,crit' },
  { plain: 'ε_dd', base: 'ε', sub: 'dd' },
  { plain: 'E_F0', base: 'E', sub: 'F0' },
  { plain: 'K_F0', base: 'K', sub: 'F0' },
  { plain: 'k_B', base: 'k', sub: 'B' },
];
const PATTERN = new RegExp(`(${SYMBOLS.map((s) => s.plain.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('|')})`);

/**
 * Text that may contain physics symbols (ε_dd, ε_dd,crit, E_F0, …), shown with real
 * subscripts instead of raw underscores. Screen readers read "epsilon dd".
 */
@Component({
  selector: 'tw-symbol-text',
  template: `@for (part of parts(); track $index) {@if (part.sub) {<span class="sym">{{ part.base }}<sub>{{ part.sub }}</sub></span>} @else {{{ part.text }}}}`,
  styles: `sub { font-size: max(12px, 0.75em); line-height: 0; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SymbolText {
  readonly text = input.required<string>();

  protected readonly parts = computed(() =>
    this.text()
      .split(PATTERN)
      .filter((t) => t !== '')
      .map((t) => {
        const symbol = SYMBOLS.find((s) => s.plain === t);
        return symbol ? { text: t, base: symbol.base, sub: symbol.sub } : { text: t, base: '', sub: '' };
      }),
  );
}

/** The same text for places that cannot hold markup (canvas, title attributes): no underscores. */
export function plainSymbols(text: string): string {
  return text.replace(/ε_dd,crit/g, 'εdd,crit').replace(/ε_dd/g, 'εdd').replace(/E_F0/g, 'EF0').replace(/K_F0/g, 'KF0').replace(/k_B/g, 'kB');
}
