import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { HandoverItem } from '../../../shared/handover/handover-api';
import { errorText } from '../api/error-text';
import { formatLocalDateTime } from '../readout/format-quantity';
import { HandoverClient } from './handover-client';

/**
 * Open items: those carried in from earlier shifts and this shift's own, each closable with a
 * note; while a draft, the author adds or removes this shift's new items.
 */
@Component({
  selector: 'tw-open-items',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <ul class="items">
      @for (item of stored(); track item.id) {
        <li [class.closed]="item.closed">
          <div class="line">
            <mat-icon aria-hidden="true" inline>{{ item.closed ? 'check_circle' : 'radio_button_unchecked' }}</mat-icon>
            <span class="text">{{ item.text }}</span>
            <span class="by">{{ item.carried ? 'carried forward' : 'new' }}, opened by {{ item.openedBy }}</span>
            @if (!item.closed && canClose() && closing() !== item.id) {
              <button mat-button type="button" (click)="closing.set(item.id); note.set('')">Close…</button>
            }
          </div>
          @if (item.closed; as c) {
            <p class="closed-note">Closed {{ local(c.at) }} by {{ c.by }}: “{{ c.note }}”</p>
          }
          @if (closing() === item.id) {
            <form class="close-form" (ngSubmit)="close(item.id!)">
              <mat-form-field appearance="outline">
                <mat-label>How was it settled?</mat-label>
                <input matInput name="note" [ngModel]="note()" (ngModelChange)="note.set($event)" />
              </mat-form-field>
              <button mat-button type="button" (click)="closing.set(null)">Cancel</button>
              <button mat-flat-button type="submit" [disabled]="busy()">Close item</button>
            </form>
          }
        </li>
      }
      @if (!editable()) {
        @for (text of newItems(); track $index) {
          <li><div class="line"><mat-icon aria-hidden="true" inline>radio_button_unchecked</mat-icon><span class="text">{{ text }}</span><span class="by">new</span></div></li>
        }
      }
      @if (stored().length === 0 && newItems().length === 0) {
        <li class="none">No open items.</li>
      }
    </ul>
    @if (problem(); as text) {
      <p class="problem" role="alert">{{ text }}</p>
    }
    @if (editable()) {
      <div class="new">
        @for (text of newItems(); track $index) {
          <div class="new-row">
            <mat-form-field appearance="outline">
              <mat-label>New open item</mat-label>
              <input matInput [ngModel]="text" (ngModelChange)="editItem($index, $event)" [name]="'item' + $index" />
            </mat-form-field>
            <button mat-icon-button type="button" (click)="removeItem($index)" aria-label="Remove this item"><mat-icon>delete</mat-icon></button>
          </div>
        }
        <button mat-stroked-button type="button" (click)="newItemsChange.emit([...newItems(), ''])"><mat-icon aria-hidden="true">add</mat-icon> Add an open item</button>
      </div>
    }
  `,
  styles: `
    .items {
      list-style: none;
      margin: 0;
      padding: 0;
      display: flex;
      flex-direction: column;
      gap: 6px;
    }
    .line {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 10px;
    }
    .by,
    .closed-note,
    .none {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      margin: 0;
    }
    .closed .text {
      text-decoration: line-through;
    }
    .closed-note {
      margin-left: 24px;
    }
    .close-form,
    .new-row {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px;
    }
    .close-form mat-form-field,
    .new-row mat-form-field {
      flex: 1 1 300px;
    }
    .new {
      margin-top: 10px;
    }
    .problem {
      color: var(--tw-trip-text);
      margin: 4px 0 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OpenItems {
  readonly items = input.required<HandoverItem[]>();
  readonly editable = input(false);
  readonly canClose = input(false);
  /** Texts of this shift's new items (not numbered until submitted). */
  readonly newItems = input<string[]>([]);
  readonly newItemsChange = output<string[]>();
  readonly closed = output<void>();

  private readonly client = inject(HandoverClient);
  protected readonly closing = signal<number | null>(null);
  protected readonly note = signal('');
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected stored(): HandoverItem[] {
    return this.items().filter((i) => i.id !== null);
  }

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected editItem(index: number, text: string): void {
    this.newItemsChange.emit(this.newItems().map((t, i) => (i === index ? text : t)));
  }

  protected removeItem(index: number): void {
    this.newItemsChange.emit(this.newItems().filter((_, i) => i !== index));
  }

  protected async close(id: number): Promise<void> {
    this.busy.set(true);
    try {
      await this.client.closeItem(id, this.note());
      this.closing.set(null);
      this.problem.set(null);
      this.closed.emit();
    } catch (error) {
      this.problem.set(errorText(error));
    } finally {
      this.busy.set(false);
    }
  }
}
