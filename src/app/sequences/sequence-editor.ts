import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal, type OnInit } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, type AbstractControl } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { SequenceRecord, SequenceStep } from '../../../shared/steering/steering-api';
import { map } from 'rxjs';
import { fieldMessage, markFields, placeServerError } from '../api/field-errors';
import { formatQuantity } from '../readout/format-quantity';
import { PathMap } from '../steering/path-map';
import { PreflightTable } from '../steering/preflight-table';
import { mapPath, SteeringRequests, type SequencePreview } from '../steering/steering-requests';
import { AspectChart } from './aspect-chart';
import { blankStep, checkDrafts, draftOfStep, totalDurationMs, type RowProblem, type StepDraft } from './sequence-draft';

/** The inputs of one step row. */
type StepRow = FormGroup<{ [K in keyof StepDraft]: FormControl<StepDraft[K]> }>;

function stepRow(d: StepDraft): StepRow {
  const text = (value: string) => new FormControl(value, { nonNullable: true });
  return new FormGroup({
    kind: new FormControl(d.kind, { nonNullable: true }),
    magnitudeG: text(d.magnitudeG),
    thetaDeg: text(d.thetaDeg),
    phiDeg: text(d.phiDeg),
    durationS: text(d.durationS),
    label: text(d.label),
  });
}

/**
 * Editor of a sequence version (lead): a table of steps checked as they are typed, the total
 * duration, a preview from the present field (the path on the orientation map, the predicted
 * β along it as a chart, and the pre-flight), and saving as the next version with a reason.
 */
@Component({
  selector: 'tw-sequence-editor',
  imports: [AspectChart, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, PathMap, PreflightTable, ReactiveFormsModule],
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

  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true }),
    reason: new FormControl('', { nonNullable: true }),
    steps: new FormArray<StepRow>([]),
  });
  protected readonly steps = this.form.controls.steps;
  private readonly rows = toSignal(this.steps.valueChanges.pipe(map((): StepDraft[] => this.steps.getRawValue())), { initialValue: [] });
  protected readonly fieldMessage = fieldMessage;
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

  constructor() {
    // A changed step makes the shown preview belong to other steps.
    this.steps.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.preview.set(null));
  }

  ngOnInit(): void {
    const start = this.start();
    this.form.controls.name.setValue(start?.name ?? '');
    for (const d of start ? start.steps.map(draftOfStep) : [blankStep('ramp'), blankStep('hold'), blankStep('shot')]) this.steps.push(stepRow(d));
  }

  /** What to fix in row `index` and the input it concerns: the check as typed, else the server's refusal. */
  protected rowProblem(index: number, row: StepRow): RowProblem | null {
    const typed = this.checked().problems[index];
    if (typed) return { field: typed.field, message: `Step ${index + 1}: ${typed.message}` };
    for (const [field, control] of Object.entries(row.controls)) {
      const message = fieldMessage(control);
      if (message) return { field: field as keyof StepDraft, message };
    }
    return null;
  }

  protected setKind(index: number, kind: SequenceStep['kind']): void {
    const row = this.steps.at(index);
    if (row.controls.kind.value !== kind) row.setValue(blankStep(kind));
  }

  protected add(kind: SequenceStep['kind']): void {
    this.steps.push(stepRow(blankStep(kind)));
  }

  protected remove(index: number): void {
    this.steps.removeAt(index);
  }

  protected move(index: number, by: -1 | 1): void {
    const to = index + by;
    if (to < 0 || to >= this.steps.length) return;
    const row = this.steps.at(index);
    this.steps.removeAt(index, { emitEvent: false });
    this.steps.insert(to, row);
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
      this.problem.set(placeServerError(err, this.requestControls()));
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
    const name = this.form.controls.name.value.trim();
    const reason = this.form.controls.reason.value.trim();
    const missing = { name: name ? undefined : 'Name must not be empty', reason: reason ? undefined : 'Reason (goes into the audit trail) must say why' };
    this.problem.set(null);
    markFields(this.form.controls, missing);
    if (!name || !reason) return;
    this.saving.set(true);
    try {
      this.saved.emit(await this.requests.saveSequence(name, steps, reason));
    } catch (err) {
      this.problem.set(placeServerError(err, this.requestControls()));
    } finally {
      this.saving.set(false);
    }
  }

  /** The inputs by their path in the request (`steps.2.thetaDeg`; durations go as `durationMs`). */
  private requestControls(): Record<string, AbstractControl> {
    const { name, reason } = this.form.controls;
    const cells = this.steps.controls.flatMap((row, i) =>
      Object.entries({ ...row.controls, durationMs: row.controls.durationS }).map(([key, control]): [string, AbstractControl] => [`steps.${i}.${key}`, control]),
    );
    return { name, reason, ...Object.fromEntries(cells) };
  }
}
