import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/**
 * A drop zone for one file with a "Choose file…" button beside it: shows the chosen file's
 * name and size, and emits the file dropped or picked (or a sentence when several are dropped).
 */
@Component({
  selector: 'tw-file-drop',
  imports: [MatIconModule],
  templateUrl: './file-drop.html',
  styleUrl: './file-drop.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  // A file dropped just beside the zone must not make the browser open it in place of the app.
  host: { '(window:dragover)': 'keepFileOutOfWindow($event)', '(window:drop)': 'keepFileOutOfWindow($event)' },
})
export class FileDrop {
  /** The file chosen so far, shown in the zone; null shows `prompt`. */
  readonly file = input<File | null>(null);
  /** What to drop, e.g. "Drop a measurement file (CSV) here, or". */
  readonly prompt = input.required<string>();
  readonly accept = input('.csv,text/csv,text/plain');
  readonly chosen = output<File>();
  readonly refused = output<string>();

  protected readonly dragging = signal(false);

  protected dragOver(event: DragEvent): void {
    event.preventDefault();
    if (event.dataTransfer) event.dataTransfer.dropEffect = 'copy';
    this.dragging.set(true);
  }

  /** Leaving the zone for one of its own children is no leaving. */
  protected dragLeave(event: DragEvent): void {
    const zone = event.currentTarget as HTMLElement;
    if (!(event.relatedTarget instanceof Node && zone.contains(event.relatedTarget))) this.dragging.set(false);
  }

  protected keepFileOutOfWindow(event: DragEvent): void {
    if (event.dataTransfer?.types.includes('Files')) event.preventDefault();
  }

  protected drop(event: DragEvent): void {
    event.preventDefault();
    event.stopPropagation();
    this.dragging.set(false);
    this.choose(event.dataTransfer?.files ?? null);
  }

  protected choose(files: FileList | null): void {
    if (!files || files.length === 0) return;
    if (files.length > 1) this.refused.emit('Drop one file at a time.');
    else this.chosen.emit(files[0]);
  }
}
