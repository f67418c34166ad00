import { ChangeDetectionStrategy, Component, computed, DestroyRef, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { RunRecord, SequenceRecord } from '../../../shared/steering/steering-api';
import { errorText } from '../api/error-text';
import { formatLocalDateTime, formatLocalTime, formatNumber, formatQuantity, formatAzimuth, NO_VALUE } from '../readout/format-quantity';
import { SteeringRequests } from '../steering/steering-requests';
import { describeStep } from './sequence-draft';

/** How often a running run is read, ms. */
const POLL_MS = 1000;

/**
 * One run: state, the step being executed with progress, abort (operators) while it runs, and
 * its shots with the measured field and the prediction recorded for each.
 */
@Component({
  selector: 'tw-run-panel',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, RouterLink],
  templateUrl: './run-panel.html',
  styleUrl: './run-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RunPanel {
  private readonly requests = inject(SteeringRequests);

  readonly runId = input.required<number>();
  /** The sequence versions, to describe the step in progress. */
  readonly sequences = input<readonly SequenceRecord[]>([]);
  readonly mayCommand = input(false);
  readonly ended = output<void>();

  protected readonly run = signal<RunRecord | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly abortReason = signal('');
  private loadedId: number | null = null;

  protected readonly stepText = computed(() => {
    const r = this.run();
    const seq = this.sequences().find((s) => s.id === r?.sequenceId);
    const step = r && seq ? seq.steps[r.step] : undefined;
    return step ? describeStep(step) : null;
  });
  protected readonly fraction = computed(() => {
    const r = this.run();
    if (!r || r.stepCount === 0) return 0;
    return r.state === 'done' ? 1 : r.step / r.stepCount;
  });

  constructor() {
    const timer = setInterval(() => void this.poll(), POLL_MS);
    inject(DestroyRef).onDestroy(() => clearInterval(timer));
  }

  private async poll(): Promise<void> {
    const id = this.runId();
    const r = this.run();
    if (r && r.id === id && r.state !== 'running' && this.loadedId === id) return;
    try {
      const next = await this.requests.getRun(id);
      const wasRunning = this.run()?.state === 'running';
      this.run.set(next);
      this.loadedId = id;
      if (wasRunning && next.state !== 'running') this.ended.emit();
    } catch (err) {
      this.problem.set(errorText(err));
    }
  }

  protected async abort(): Promise<void> {
    const reason = this.abortReason().trim();
    if (!reason) {
      this.problem.set('Say why in “Reason for the abort” first (it goes into the audit trail).');
      return;
    }
    try {
      this.run.set(await this.requests.abortRun(this.runId(), reason));
      this.problem.set(null);
      this.ended.emit();
    } catch (err) {
      this.problem.set(errorText(err));
    }
  }

  protected time(iso: string | null): string {
    return iso ? formatLocalDateTime(Date.parse(iso)) : '—';
  }

  protected clock(iso: string): string {
    return formatLocalTime(Date.parse(iso));
  }

  protected readonly azimuth = formatAzimuth;

  protected q(v: number | null | undefined, unit: string, digits: number): string {
    return unit ? formatQuantity(v, unit, digits) : v === null || v === undefined ? NO_VALUE : formatNumber(v, digits);
  }
}
