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
import { FileDrop } from '../files/file-drop';

/**
 * Upload of a measurement file (drag and drop or file chooser) with the optional Zeeman
 * coefficient; the server fits it and stores a draft. Emits the draft once it is stored.
 */
@Component({
  selector: 'tw-calibration-upload',
  imports: [FileDrop, FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './calibration-upload.html',
  styleUrl: './calibration-upload.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationUpload {
  private readonly http = inject(HttpClient);
  readonly fitted = output<CalibrationFitResponse>();

  protected readonly file = signal<File | null>(null);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected mhzPerGauss = '';

  protected choose(file: File): void {
    this.error.set(null);
    this.file.set(file);
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
