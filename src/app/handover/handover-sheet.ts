import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, output, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { hasRole, type Role } from '../../../shared/auth/roles';
import { HANDOVER_SECTIONS, type Handover, type HandoverNotes, type HandoverSection } from '../../../shared/handover/handover-api';
import { errorText } from '../api/error-text';
import { formatLocalDateTime } from '../readout/format-quantity';
import { HandoverClient } from './handover-client';
import { OpenItems } from './open-items';
import { RecordSection } from './record-section';

/** Our names of the checklist sections. */
export const SECTION_TITLES: Record<HandoverSection, string> = {
  apparatus: 'Apparatus now',
  alarms: 'Alarms away from normal',
  trips: 'Interlock trips and resets',
  changes: 'Calibration, profile and limit changes',
  runs: 'Runs and shots',
  logbook: 'Logbook entries of the shift',
  openItems: 'Open items',
};

/**
 * One handover as a checklist: each section shows what the server recorded (read-only) and the
 * outgoing person's notes (editable while a draft, by its author or a lead). The incoming person
 * ticks every section as read before accepting; whoever handed over cannot accept.
 */
@Component({
  selector: 'tw-handover-sheet',
  imports: [FormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule, OpenItems, RecordSection],
  templateUrl: './handover-sheet.html',
  styleUrl: './handover-sheet.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HandoverSheet {
  readonly handover = input.required<Handover>();
  readonly me = input.required<{ email: string; role: Role }>();
  /** The handover after a change the server accepted. */
  readonly changed = output<Handover>();

  private readonly client = inject(HandoverClient);
  protected readonly sections = HANDOVER_SECTIONS;
  protected readonly titles = SECTION_TITLES;

  protected readonly summary = linkedSignal(() => this.handover().summary);
  protected readonly notes = linkedSignal<HandoverNotes>(() => ({ ...this.handover().notes }));
  protected readonly newItems = linkedSignal(() => this.handover().openItems.filter((i) => i.id === null).map((i) => i.text));
  protected readonly read = linkedSignal<Handover, ReadonlySet<HandoverSection>>({ source: this.handover, computation: () => new Set() });
  protected readonly comment = signal('');
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly saved = signal(false);

  protected readonly canEdit = computed(() => {
    const h = this.handover();
    const me = this.me();
    return h.status === 'draft' && hasRole(me.role, 'operator') && (me.email === h.author || hasRole(me.role, 'lead'));
  });
  protected readonly handedOverByMe = computed(() => {
    const h = this.handover();
    return this.me().email === h.author || this.me().email === h.submitted?.by;
  });
  protected readonly canAccept = computed(() => this.handover().status === 'submitted' && hasRole(this.me().role, 'operator') && !this.handedOverByMe());
  protected readonly allRead = computed(() => this.sections.every((s) => this.read().has(s)));
  protected readonly unread = computed(() => this.sections.filter((s) => !this.read().has(s)).length);

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected setNote(section: HandoverSection, text: string): void {
    this.notes.update((n) => ({ ...n, [section]: text }));
    this.saved.set(false);
  }

  protected toggleRead(section: HandoverSection, on: boolean): void {
    this.read.update((set) => {
      const next = new Set(set);
      if (on) next.add(section);
      else next.delete(section);
      return next;
    });
  }

  protected setNewItems(items: string[]): void {
    this.newItems.set(items);
    this.saved.set(false);
  }

  protected save(): Promise<void> {
    return this.run(async () => {
      const handover = await this.client.save(this.handover().id, this.edit());
      this.saved.set(true);
      return handover;
    });
  }

  protected submit(): Promise<void> {
    return this.run(async () => {
      await this.client.save(this.handover().id, this.edit());
      return this.client.submit(this.handover().id);
    });
  }

  protected accept(): Promise<void> {
    return this.run(() => this.client.accept(this.handover().id, this.comment()));
  }

  protected async itemClosed(): Promise<void> {
    await this.run(() => this.client.get(this.handover().id));
  }

  private edit() {
    const notes = Object.fromEntries(Object.entries(this.notes()).filter(([, text]) => (text ?? '').trim() !== '')) as HandoverNotes;
    return { summary: this.summary(), notes, openItems: this.newItems().filter((t) => t.trim() !== '').map((text) => ({ text })) };
  }

  private async run(action: () => Promise<Handover>): Promise<void> {
    this.busy.set(true);
    this.problem.set(null);
    try {
      this.changed.emit(await action());
    } catch (error) {
      this.problem.set(errorText(error));
    } finally {
      this.busy.set(false);
    }
  }
}
