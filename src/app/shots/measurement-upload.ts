import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { firstValueFrom } from 'rxjs';
import { MEASUREMENT_COLUMNS, type MeasurementUploadResponse } from '../../../shared/shots/shots-api';
import { errorText } from '../api/error-text';
import { FileDrop } from '../files/file-drop';

/**
 * Upload of the imaging analysis's measurement file (drop or file chooser). The server stores
 * all its lines or none; its refusal (which line, what is wrong) is shown beside the control.
 * Emits the number of shots stored.
 */
@Component({
  selector: 'tw-measurement-upload',
  imports: [FileDrop, MatButtonModule, MatIconModule],
  template: `
    <section class="upload" aria-labelledby="tw-measurement-upload">
      <h2 id="tw-measurement-upload">Add measured images</h2>
      <tw-file-drop [file]="file()" prompt="Drop the imaging analysis's CSV here, or" (chosen)="choose($event)" (refused)="error.set($event)" />
      <p class="hint">
        Columns: <code>{{ columns }}</code> (σ optional). The aspect ratio is long over short axis; the angle is the long axis's in the camera frame.
        A shot uploaded again gets the new value; the old one stays in the audit trail.
      </p>
      <div class="actions">
        <button mat-flat-button type="button" [disabled]="!file() || busy()" (click)="upload()">
          <mat-icon>upload</mat-icon> {{ busy() ? 'Storing…' : 'Store measurements' }}
        </button>
        @if (error(); as text) {
          <p class="error" role="alert"><mat-icon aria-hidden="true" inline>error</mat-icon> {{ text }}</p>
        }
      </div>
    </section>
  `,
  styles: `
    h2 { font: var(--mat-sys-title-medium); margin: 0 0 8px; }
    .hint { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    .actions { display: flex; flex-wrap: wrap; align-items: center; gap: 8px 16px; }
    .error { margin: 0; color: var(--tw-alarm-text); font: var(--mat-sys-body-medium); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MeasurementUpload {
  private readonly http = inject(HttpClient);
  readonly stored = output<number>();

  protected readonly columns = MEASUREMENT_COLUMNS.join(', ');
  protected readonly file = signal<File | null>(null);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected choose(file: File): void {
    this.error.set(null);
    this.file.set(file);
  }

  protected async upload(): Promise<void> {
    const file = this.file();
    if (!file || this.busy()) return;
    const form = new FormData();
    form.append('file', file, file.name);
    this.busy.set(true);
    this.error.set(null);
    try {
      const response = await firstValueFrom(this.http.post<MeasurementUploadResponse>('/api/shots/measurements', form));
      this.file.set(null);
      this.stored.emit(response.stored);
    } catch (err) {
      this.error.set(errorText(err));
    } finally {
      this.busy.set(false);
    }
  }
}
