import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { ATTACHMENT_TYPES_TEXT, MAX_ATTACHMENT_BYTES, MAX_ATTACHMENTS, MAX_ENTRY_CHARS, type LogbookEntry } from '../../../shared/logbook/logbook-api';
import { fieldMessage, markField, placeServerError } from '../api/field-errors';
import { LogbookClient } from './logbook-client';
import { renderMarkdown } from './markdown';

/**
 * Writing an entry: Markdown text with a preview, tags, the time it refers to, a link, and files
 * (chosen, pasted or dropped; images, PDF, CSV up to 10 MB). The server checks every file by its
 * content; its refusal is shown here and nothing is stored. A correction names the entry it amends.
 */
@Component({
  selector: 'tw-entry-composer',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, ReactiveFormsModule],
  templateUrl: './entry-composer.html',
  styleUrl: './entry-composer.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EntryComposer {
  /** The entry being corrected, or null for a new note. */
  readonly amending = input<LogbookEntry | null>(null);
  readonly written = output<number>();
  readonly cancelAmend = output<void>();

  private readonly client = inject(LogbookClient);
  protected readonly maxChars = MAX_ENTRY_CHARS;
  protected readonly typesText = ATTACHMENT_TYPES_TEXT;
  /** The inputs, by the request field each one sends (`at` as typed in local time). */
  protected readonly form = new FormGroup({
    text: new FormControl('', { nonNullable: true }),
    tags: new FormControl('', { nonNullable: true }),
    at: new FormControl('', { nonNullable: true }),
    link: new FormControl('', { nonNullable: true }),
  });
  protected readonly fieldMessage = fieldMessage;
  private readonly text = toSignal(this.form.controls.text.valueChanges, { initialValue: '' });
  protected readonly files = signal<File[]>([]);
  protected readonly preview = signal(false);
  protected readonly dragging = signal(false);
  protected readonly sending = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly previewHtml = computed(() => renderMarkdown(this.text()));

  protected addFiles(list: FileList | File[] | null | undefined): void {
    if (!list) return;
    const incoming = [...list];
    const tooBig = incoming.find((f) => f.size > MAX_ATTACHMENT_BYTES);
    if (tooBig) {
      this.problem.set(`"${tooBig.name}" is larger than 10 MB; attach a smaller file.`);
      return;
    }
    const next = [...this.files(), ...incoming];
    if (next.length > MAX_ATTACHMENTS) {
      this.problem.set(`At most ${MAX_ATTACHMENTS} files per entry.`);
      return;
    }
    this.problem.set(null);
    this.files.set(next);
  }

  protected removeFile(index: number): void {
    this.files.update((list) => list.filter((_, i) => i !== index));
  }

  /** Images pasted into the text box become attachments (a screenshot from the clipboard). */
  protected onPaste(event: ClipboardEvent): void {
    const items = [...(event.clipboardData?.items ?? [])].filter((i) => i.kind === 'file' && i.type.startsWith('image/'));
    const images = items.map((i) => i.getAsFile()).filter((f): f is File => f !== null);
    if (images.length === 0) return;
    event.preventDefault();
    const stamp = new Date().toISOString().slice(0, 19).replace(/[:T]/g, '-');
    this.addFiles(images.map((f, i) => new File([f], f.name && f.name !== 'image.png' ? f.name : `pasted-${stamp}${i ? `-${i}` : ''}.png`, { type: f.type })));
  }

  protected onDrop(event: DragEvent): void {
    event.preventDefault();
    this.dragging.set(false);
    this.addFiles(event.dataTransfer?.files);
  }

  protected onDragOver(event: DragEvent): void {
    if (!event.dataTransfer?.types.includes('Files')) return;
    event.preventDefault();
    this.dragging.set(true);
  }

  protected async send(): Promise<void> {
    const { text, tags, at, link } = this.form.getRawValue();
    this.problem.set(null);
    if (text.trim() === '') {
      markField(this.form.controls.text, 'Entry: write what happened; an entry cannot be empty');
      this.preview.set(false);
      return;
    }
    this.sending.set(true);
    try {
      const id = await this.client.write({ text, tags, at: at ? new Date(at).toISOString() : '', link, amends: this.amending()?.id ?? null, files: this.files() });
      this.form.reset();
      this.files.set([]);
      this.preview.set(false);
      this.written.emit(id);
    } catch (error) {
      this.problem.set(placeServerError(error, this.form.controls));
      // The entry's own message stands under its text box, which the preview hides.
      if (this.form.controls.text.invalid) this.preview.set(false);
    } finally {
      this.sending.set(false);
    }
  }
}
