import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { PreflightCheck } from '../../../shared/steering/steering-api';
import { SymbolText } from '../readout/symbol-text';
import { CHECK_LABELS, checkLimitText, checkValueText } from './check-text';

/** The pre-flight checks as a table: each with pass/fails (icon and word), worst value, limit and the server's sentence. */
@Component({
  selector: 'tw-preflight-table',
  imports: [MatIconModule, SymbolText],
  template: `
    <table class="checks" [attr.aria-label]="caption()">
      <thead>
        <tr><th scope="col">Check</th><th scope="col">Result</th><th scope="col">Worst on the path</th><th scope="col">Limit</th><th scope="col">What it means</th></tr>
      </thead>
      <tbody>
        @for (c of checks(); track c.name) {
          <tr [class.fails]="!c.ok">
            <th scope="row"><tw-symbol-text [text]="labels[c.name]" /></th>
            <td class="result">
              <mat-icon aria-hidden="true" inline>{{ c.ok ? 'check_circle' : 'cancel' }}</mat-icon>
              {{ c.ok ? 'passes' : 'fails' }}
            </td>
            <td class="num">{{ value(c) }}</td>
            <td class="num">{{ limit(c) }}</td>
            <td class="message"><tw-symbol-text [text]="c.message" /></td>
          </tr>
        }
      </tbody>
    </table>
  `,
  styles: `
    :host {
      display: block;
      overflow-x: auto;
    }
    table {
      border-collapse: collapse;
      width: 100%;
      font: var(--mat-sys-body-medium);
    }
    th,
    td {
      text-align: left;
      padding: 6px 10px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      vertical-align: top;
    }
    thead th {
      font: var(--mat-sys-label-large);
      color: var(--mat-sys-on-surface-variant);
    }
    .num {
      font-variant-numeric: tabular-nums;
      white-space: nowrap;
    }
    .result {
      white-space: nowrap;
    }
    tr.fails .result,
    tr.fails th {
      color: var(--tw-alarm-text);
      font-weight: 600;
    }
    .message {
      max-width: 70ch;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PreflightTable {
  readonly checks = input.required<readonly PreflightCheck[]>();
  readonly caption = input('Pre-flight checks');
  protected readonly labels = CHECK_LABELS;
  protected value = checkValueText;
  protected limit = checkLimitText;
}
