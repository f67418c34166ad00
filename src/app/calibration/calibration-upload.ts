import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, output, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import type { CalibrationFitResponse } from '../../../shared/field/calibration-record';
import { errorText } from '../api/error-text';

/**
 * Upload of a measurement file (drag and drop or file chooser) with the optional Zeeman
 * coefficient; the server fits it and stores a draft. Emits the draft once it is stored.
 */
@Component({
  selector: 'tw-calibration-upload',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './calibration-upload.html',
  styleUrl: './calibration-upload.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  // A file dropped just beside the drop zone must not make the browser open it in place of the app.
  host: { '(window:dragover)': 'keepFileOutOfWindow($event)', '(window:drop)': 'keepFileOutOfWindow($event)' },
})
export class CalibrationUpload {
  private readonly http = inject(HttpClient);
  readonly fitted = output<CalibrationFitResponse>();

  protected readonly file = signal<File | null>(null);
  protected readonly dragging = signal(false);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected mhzPerGauss = '';

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
    this.error.set(null);
    if (!files || files.length === 0) return;
    if (files.length > 1) {
      this.error.set('Drop one file at a time.');
      return;
    }
    this.file.set(files[0]);
  }

  protected async fit(): Promise<void> {
    const file = this.file();
    if (!file || this.busy()) return;
    const form = new FormData();
    form.append('file', file, file.name);
    if (this.mhzPerGauss.trim() !== '') form.append('mhzPerGauss', this.mhzPerGauss.trim());
    this.busy.set(true);
    this.error.set(null);
    try {
      const response = await firstValueFrom(this.http.post<CalibrationFitResponse>('/api/calibrations/fits', form));
      this.file.set(null);
      this.fitted.emit(response);
    } catch (err) {
      this.error.set(errorText(err));
    } finally {
      this.busy.set(false);
    }
  }
}
