import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { HandoverItem } from '../../../shared/handover/handover-api';
import { fieldMessage, placeServerError } from '../api/field-errors';
import { formatLocalDateTime } from '../readout/format-quantity';
import { HandoverClient } from './handover-client';

/**
 * Open items: those carried in from earlier shifts and this shift's own, each closable with a
 * note; while a draft, the author adds or removes this shift's new items.
 */
@Component({
  selector: 'tw-open-items',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, ReactiveFormsModule],
  template: `
    <ul class="items">
      @for (item of stored(); track item.id) {
        <li [class.closed]="item.closed">
          <div class="line">
            <mat-icon aria-hidden="true" inline>{{ item.closed ? 'check_circle' : 'radio_button_unchecked' }}</mat-icon>
            <span class="text">{{ item.text }}</span>
            <span class="by">{{ item.carried ? 'carried forward' : 'new' }}, opened by {{ item.openedBy }}</span>
            @if (!item.closed && canClose() && closing() !== item.id) {
              <button mat-button type="button" (click)="closing.set(item.id); closeForm.reset()">Close…</button>
            }
          </div>
          @if (item.closed; as c) {
            <p class="closed-note">Closed {{ local(c.at) }} by {{ c.by }}: “{{ c.note }}”</p>
          }
          @if (closing() === item.id) {
            <form class="close-form" [formGroup]="closeForm" (ngSubmit)="close(item.id!)">
              <mat-form-field appearance="outline">
                <mat-label>How was it settled?</mat-label>
                <input matInput formControlName="note" />
                <mat-error>{{ fieldMessage(closeForm.controls.note) }}</mat-error>
              </mat-form-field>
              <button mat-button type="button" (click)="closing.set(null)">Cancel</button>
              <button mat-flat-button type="submit" [disabled]="busy()">Close item</button>
            </form>
          }
        </li>
      }
      @if (!editable()) {
        @for (item of newItems().controls; track $index) {
          <li><div class="line"><mat-icon aria-hidden="true" inline>radio_button_unchecked</mat-icon><span class="text">{{ item.value }}</span><span class="by">new</span></div></li>
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
        @for (item of newItems().controls; track item) {
          <div class="new-row">
            <mat-form-field appearance="outline">
              <mat-label>New open item</mat-label>
              <input matInput [formControl]="item" />
              <mat-error>{{ fieldMessage(item) }}</mat-error>
            </mat-form-field>
            <button mat-icon-button type="button" (click)="newItems().removeAt($index)" aria-label="Remove this item"><mat-icon>delete</mat-icon></button>
          </div>
        }
        <button mat-stroked-button type="button" (click)="addItem()"><mat-icon aria-hidden="true">add</mat-icon> Add an open item</button>
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
  /** This shift's new items (not numbered until submitted), edited here while `editable`. */
  readonly newItems = input.required<FormArray<FormControl<string>>>();
  readonly closed = output<void>();

  private readonly client = inject(HandoverClient);
  protected readonly closing = signal<number | null>(null);
  protected readonly closeForm = new FormGroup({ note: new FormControl('', { nonNullable: true }) });
  protected readonly fieldMessage = fieldMessage;
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected stored(): HandoverItem[] {
    return this.items().filter((i) => i.id !== null);
  }

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected addItem(): void {
    this.newItems().push(new FormControl('', { nonNullable: true }));
  }

  protected async close(id: number): Promise<void> {
    this.busy.set(true);
    try {
      this.problem.set(null);
      await this.client.closeItem(id, this.closeForm.controls.note.value);
      this.closing.set(null);
      this.closed.emit();
    } catch (error) {
      this.problem.set(placeServerError(error, this.closeForm.controls));
    } finally {
      this.busy.set(false);
    }
  }
}
