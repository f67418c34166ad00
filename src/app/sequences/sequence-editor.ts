import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal, type OnInit } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { SequenceRecord, SequenceStep } from '../../../shared/steering/steering-api';
import { errorText } from '../api/error-text';
import { formatQuantity } from '../readout/format-quantity';
import { PathMap } from '../steering/path-map';
import { PreflightTable } from '../steering/preflight-table';
import { mapPath, SteeringRequests, type SequencePreview } from '../steering/steering-requests';
import { AspectChart } from './aspect-chart';
import { blankStep, checkDrafts, draftOfStep, totalDurationMs, type StepDraft } from './sequence-draft';

/**
 * Editor of a sequence version (lead): a table of steps checked as they are typed, the total
 * duration, a preview from the present field (the path on the orientation map, the predicted
 * β along it as a chart, and the pre-flight), and saving as the next version with a reason.
 */
@Component({
  selector: 'tw-sequence-editor',
  imports: [AspectChart, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, PathMap, PreflightTable],
  templateUrl: './sequence-editor.html',
  styleUrl: './sequence-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SequenceEditor implements OnInit {
  private readonly requests = inject(SteeringRequests);

  /** The version the edit starts from; null for a new sequence. */
  readonly start = input<SequenceRecord | null>(null);
  readonly saved = output<{ id: number; version: number }>();
  readonly closed = output<void>();

  protected readonly name = signal('');
  protected readonly reason = signal('');
  protected readonly rows = signal<StepDraft[]>([]);
  protected readonly preview = signal<SequencePreview | null>(null);
  protected readonly previewing = signal(false);
  protected readonly saving = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected readonly checked = computed(() => checkDrafts(this.rows()));
  protected readonly totalText = computed(() => {
    const steps = this.checked().steps;
    return steps ? formatQuantity(totalDurationMs(steps) / 1000, 's', 1) : '—';
  });
  protected readonly mapPathOf = computed(() => mapPath(this.preview()?.path ?? []));

  ngOnInit(): void {
    const start = this.start();
    this.name.set(start?.name ?? '');
    this.rows.set(start ? start.steps.map(draftOfStep) : [blankStep('ramp'), blankStep('hold'), blankStep('shot')]);
  }

  protected editRow(index: number, field: keyof StepDraft, value: string): void {
    this.rows.update((rows) => rows.map((r, i) => (i === index ? { ...r, [field]: value } : r)));
    this.preview.set(null);
  }

  protected setKind(index: number, kind: SequenceStep['kind']): void {
    this.rows.update((rows) => rows.map((r, i) => (i === index ? { ...blankStep(kind), ...(kind === r.kind ? r : {}) } : r)));
    this.preview.set(null);
  }

  protected add(kind: SequenceStep['kind']): void {
    this.rows.update((rows) => [...rows, blankStep(kind)]);
    this.preview.set(null);
  }

  protected remove(index: number): void {
    this.rows.update((rows) => rows.filter((_, i) => i !== index));
    this.preview.set(null);
  }

  protected move(index: number, by: -1 | 1): void {
    this.rows.update((rows) => {
      const next = [...rows];
      const to = index + by;
      if (to < 0 || to >= next.length) return rows;
      [next[index], next[to]] = [next[to], next[index]];
      return next;
    });
    this.preview.set(null);
  }

  protected async runPreview(): Promise<void> {
    const steps = this.checked().steps;
    if (!steps) {
      this.problem.set('Fix the steps marked in the table first.');
      return;
    }
    this.problem.set(null);
    this.previewing.set(true);
    try {
      this.preview.set(await this.requests.previewSequence(steps));
    } catch (err) {
      this.problem.set(errorText(err));
    } finally {
      this.previewing.set(false);
    }
  }

  protected async save(): Promise<void> {
    const steps = this.checked().steps;
    if (!steps) {
      this.problem.set('Fix the steps marked in the table first.');
      return;
    }
    if (!this.name().trim()) {
      this.problem.set('Name must not be empty.');
      return;
    }
    if (!this.reason().trim()) {
      this.problem.set('Reason must say why (it goes into the audit trail).');
      return;
    }
    this.saving.set(true);
    try {
      this.saved.emit(await this.requests.saveSequence(this.name().trim(), steps, this.reason().trim()));
    } catch (err) {
      this.problem.set(errorText(err));
    } finally {
      this.saving.set(false);
    }
  }
}
