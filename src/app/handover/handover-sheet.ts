import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, output, signal } from '@angular/core';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, type AbstractControl } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { hasRole, type Role } from '../../../shared/auth/roles';
import { HANDOVER_SECTIONS, type Handover, type HandoverNotes, type HandoverSection } from '../../../shared/handover/handover-api';
import { fieldMessage, placeServerError } from '../api/field-errors';
import { formatLocalDateTime } from '../readout/format-quantity';
import { HandoverClient, type HandoverEdit } from './handover-client';
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
  imports: [MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule, OpenItems, ReactiveFormsModule, RecordSection],
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

  /** The outgoing person's inputs, filled from the handover as the server holds it. */
  protected readonly form = computed(() => draftForm(this.handover()));
  protected readonly read = linkedSignal<Handover, ReadonlySet<HandoverSection>>({ source: this.handover, computation: () => new Set() });
  protected readonly comment = new FormControl('', { nonNullable: true });
  protected readonly fieldMessage = fieldMessage;
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

  constructor() {
    effect((onCleanup) => {
      const changes = this.form().valueChanges.subscribe(() => this.saved.set(false));
      onCleanup(() => changes.unsubscribe());
    });
  }

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected toggleRead(section: HandoverSection, on: boolean): void {
    this.read.update((set) => {
      const next = new Set(set);
      if (on) next.add(section);
      else next.delete(section);
      return next;
    });
  }

  protected save(): Promise<void> {
    const edit = this.edit();
    return this.run(edit.controls, async () => {
      const handover = await this.client.save(this.handover().id, edit.body);
      this.saved.set(true);
      return handover;
    });
  }

  protected submit(): Promise<void> {
    const edit = this.edit();
    return this.run(edit.controls, async () => {
      await this.client.save(this.handover().id, edit.body);
      return this.client.submit(this.handover().id);
    });
  }

  protected accept(): Promise<void> {
    return this.run({ comment: this.comment }, () => this.client.accept(this.handover().id, this.comment.value));
  }

  protected async itemClosed(): Promise<void> {
    await this.run({}, () => this.client.get(this.handover().id));
  }

  /** The edit to send (blank notes and items left out) and, by their path in it, the inputs that typed it. */
  private edit(): { body: HandoverEdit; controls: Record<string, AbstractControl> } {
    const { summary, notes, openItems } = this.form().controls;
    const noted = HANDOVER_SECTIONS.filter((s) => notes.controls[s].value.trim() !== '');
    const items = openItems.controls.filter((c) => c.value.trim() !== '');
    return {
      body: {
        summary: summary.value,
        notes: Object.fromEntries(noted.map((s) => [s, notes.controls[s].value])) as HandoverNotes,
        openItems: items.map((c) => ({ text: c.value })),
      },
      controls: {
        summary,
        ...Object.fromEntries(noted.map((s) => [`notes.${s}`, notes.controls[s]])),
        ...Object.fromEntries(items.map((c, i) => [`openItems.${i}.text`, c])),
      },
    };
  }

  /** Runs `action`; a refusal stands beside the input of `controls` it names, else under the sheet. */
  private async run(controls: Record<string, AbstractControl>, action: () => Promise<Handover>): Promise<void> {
    this.busy.set(true);
    this.problem.set(null);
    try {
      this.changed.emit(await action());
    } catch (error) {
      this.problem.set(placeServerError(error, controls));
    } finally {
      this.busy.set(false);
    }
  }
}

const text = (value: string) => new FormControl(value, { nonNullable: true });

/** The inputs of a draft: summary, a note per section, this shift's new open items. */
function draftForm(h: Handover) {
  return new FormGroup({
    summary: text(h.summary),
    notes: new FormGroup(Object.fromEntries(HANDOVER_SECTIONS.map((s) => [s, text(h.notes[s] ?? '')])) as Record<HandoverSection, FormControl<string>>),
    openItems: new FormArray(h.openItems.filter((i) => i.id === null).map((i) => text(i.text))),
  });
}
