import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { hasRole } from '../../../shared/auth/roles';
import type { PreflightResult, RunRecord, SequenceRecord } from '../../../shared/steering/steering-api';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { InterlockCautions } from '../interlocks/interlock-cautions';
import { formatLocalDateTime, formatQuantity } from '../readout/format-quantity';
import { PreflightTable } from '../steering/preflight-table';
import { SteeringRequests } from '../steering/steering-requests';
import { RunPanel } from './run-panel';
import { describeStep, totalDurationMs } from './sequence-draft';
import { SequenceEditor } from './sequence-editor';

/**
 * The Sequences page: the stored sequences (newest version of each name, older versions on
 * request), a chosen version's steps, the editor for leads, a run with its progress and abort
 * for operators, and the recent runs with their shots.
 */
@Component({
  selector: 'tw-sequences-page',
  imports: [InterlockCautions, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, PreflightTable, RunPanel, SequenceEditor],
  templateUrl: './sequences-page.html',
  styleUrl: './sequences-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SequencesPage {
  private readonly requests = inject(SteeringRequests);
  private readonly session = inject(Session);

  private readonly role = this.session.role;
  protected readonly isLead = computed(() => hasRole(this.role() ?? 'viewer', 'lead'));
  protected readonly isOperator = computed(() => hasRole(this.role() ?? 'viewer', 'operator'));

  protected readonly sequences = signal<SequenceRecord[]>([]);
  protected readonly runs = signal<RunRecord[]>([]);
  protected readonly selectedId = signal<number | null>(null);
  protected readonly editing = signal<'new' | 'version' | null>(null);
  protected readonly shownRunId = signal<number | null>(null);
  protected readonly runReason = signal('');
  protected readonly refused = signal<PreflightResult | null>(null);
  protected readonly starting = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly notice = signal<string | null>(null);

  /** Newest version of each name, with how many versions exist. */
  protected readonly latest = computed(() => {
    const byName = new Map<string, { record: SequenceRecord; versions: number }>();
    for (const s of this.sequences()) {
      const seen = byName.get(s.name);
      if (!seen || s.version > seen.record.version) byName.set(s.name, { record: s, versions: (seen?.versions ?? 0) + 1 });
      else seen.versions++;
    }
    return [...byName.values()];
  });
  protected readonly selected = computed(() => this.sequences().find((s) => s.id === this.selectedId()) ?? null);
  protected readonly versionsOfSelected = computed(() => {
    const s = this.selected();
    return s ? this.sequences().filter((q) => q.name === s.name).sort((a, b) => b.version - a.version) : [];
  });
  protected readonly running = computed(() => this.runs().find((r) => r.state === 'running') ?? null);

  constructor() {
    void this.load();
  }

  private async load(): Promise<void> {
    try {
      const [sequences, runs] = await Promise.all([this.requests.sequences(), this.requests.runs()]);
      this.sequences.set(sequences);
      this.runs.set(runs);
      if (this.selectedId() === null && sequences.length > 0) this.selectedId.set(this.latest()[0].record.id);
      if (this.shownRunId() === null && runs.length > 0) this.shownRunId.set(runs[0].id);
    } catch (err) {
      this.problem.set(errorText(err));
    }
  }

  protected select(id: number): void {
    this.selectedId.set(id);
    this.editing.set(null);
    this.refused.set(null);
  }

  protected async saved(result: { id: number; version: number }): Promise<void> {
    this.editing.set(null);
    this.notice.set(`Saved as version ${result.version}.`);
    await this.load();
    this.selectedId.set(result.id);
  }

  protected async run(): Promise<void> {
    const s = this.selected();
    const reason = this.runReason().trim();
    if (!s) return;
    if (!reason) {
      this.problem.set('Say why in “Reason for the run” first (it goes into the audit trail).');
      return;
    }
    this.starting.set(true);
    this.problem.set(null);
    this.refused.set(null);
    try {
      const outcome = await this.requests.run(s.id, reason);
      if (outcome.kind === 'refused') {
        this.refused.set(outcome.result);
        this.problem.set('The pre-flight of the whole sequence failed: the run was not started.');
      } else {
        this.notice.set(`Run ${outcome.value.runId} started.`);
        this.runReason.set('');
        this.shownRunId.set(outcome.value.runId);
        await this.load();
      }
    } catch (err) {
      this.problem.set(errorText(err));
    } finally {
      this.starting.set(false);
    }
  }

  protected async runEnded(): Promise<void> {
    // The run panel says how it ended; the "started" notice no longer applies.
    this.notice.set(null);
    await this.load();
  }

  protected stepText = describeStep;

  protected duration(s: SequenceRecord): string {
    return formatQuantity(totalDurationMs(s.steps) / 1000, 's', 0);
  }

  protected shots(s: SequenceRecord): number {
    return s.steps.filter((q) => q.kind === 'shot').length;
  }

  protected time(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }
}
