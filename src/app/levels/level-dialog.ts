import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import {
  BAND_KINDS,
  BAND_LABELS,
  SETTING_LABELS,
  TRIP_LABELS,
  bandFieldLabel,
  windingFieldLabel,
  type BandKind,
  type LevelSet,
  type LevelSetVersion,
  type OperatingSettings,
  type TripLevels,
} from '../../../shared/levels/level-set';
import { fieldMessage, markField, placeServerError } from '../api/field-errors';
import { MAX_REASON_CHARS } from '../shared-ui/reason-dialog';

interface NumberField {
  /** Path in the level set, as the server names it in a refusal (without `levels.`). */
  path: string;
  label: string;
  control: FormControl<number | null>;
}

const num = (value: number) => new FormControl<number | null>(value);

/**
 * A lead's edit of the level set: display bands, trip levels and operating settings, sent as
 * the next version with the required reason. A refusal appears next to the field it names.
 */
@Component({
  selector: 'tw-level-dialog',
  imports: [MatButtonModule, MatDialogModule, MatFormFieldModule, MatIconModule, MatInputModule, ReactiveFormsModule],
  templateUrl: './level-dialog.html',
  styleUrl: './level-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LevelDialog {
  private readonly inForce = inject<LevelSetVersion>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<LevelDialog, LevelSetVersion>>(MatDialogRef);
  private readonly http = inject(HttpClient);

  protected readonly version = this.inForce.version;
  protected readonly bands = BAND_KINDS.map((kind) => ({
    kind,
    label: BAND_LABELS[kind].label,
    fields: (['scale', 'normal'] as const).flatMap((part) =>
      ([0, 1] as const).map((end) => this.field(`bands.${kind}.${part}.${end}`, bandFieldLabel(kind, part, end), this.inForce.levels.bands[kind][part][end])),
    ),
  }));
  protected readonly trips = (Object.keys(TRIP_LABELS) as (keyof TripLevels)[]).map((key) =>
    this.field(`trips.${key}`, TRIP_LABELS[key].label, this.inForce.levels.trips[key]),
  );
  protected readonly settings = (Object.keys(SETTING_LABELS) as (keyof OperatingSettings)[]).map((key) =>
    this.field(`settings.${key}`, SETTING_LABELS[key].label, this.inForce.levels.settings[key]),
  );
  protected readonly windings = (['x', 'y', 'z'] as const).map((axis) =>
    this.field(`windingsR20Ohm.${axis}`, windingFieldLabel(axis), this.inForce.levels.windingsR20Ohm[axis]),
  );
  protected readonly reason = new FormControl('', { nonNullable: true });
  protected readonly maxReason = MAX_REASON_CHARS;
  protected readonly problem = signal<string | null>(null);
  protected readonly sending = signal(false);
  protected readonly fieldMessage = fieldMessage;

  private field(path: string, label: string, value: number): NumberField {
    return { path, label, control: num(value) };
  }

  private allFields(): NumberField[] {
    return [...this.bands.flatMap((b) => b.fields), ...this.trips, ...this.settings, ...this.windings];
  }

  protected async save(): Promise<void> {
    const fields = this.allFields();
    const missing = fields.filter((f) => f.control.value === null || !Number.isFinite(f.control.value));
    for (const f of missing) markField(f.control, `${f.label}: enter a number`);
    const reason = this.reason.value.trim();
    if (reason === '') markField(this.reason, 'Reason for this change: say why the levels change (it goes into the audit trail).');
    if (missing.length > 0 || reason === '') return;
    const value = (path: string) => fields.find((f) => f.path === path)!.control.value as number;
    const bands = Object.fromEntries(
      BAND_KINDS.map((kind: BandKind) => [kind, {
        scale: [value(`bands.${kind}.scale.0`), value(`bands.${kind}.scale.1`)],
        normal: [value(`bands.${kind}.normal.0`), value(`bands.${kind}.normal.1`)],
      }]),
    ) as LevelSet['bands'];
    const trips = Object.fromEntries(this.trips.map((f) => [f.path.slice('trips.'.length), f.control.value])) as unknown as TripLevels;
    const settings = Object.fromEntries(this.settings.map((f) => [f.path.slice('settings.'.length), f.control.value])) as unknown as OperatingSettings;
    const windingsR20Ohm = { x: value('windingsR20Ohm.x'), y: value('windingsR20Ohm.y'), z: value('windingsR20Ohm.z') };
    this.problem.set(null);
    this.sending.set(true);
    try {
      const levels: LevelSet = { bands, trips, settings, windingsR20Ohm };
      const saved = await firstValueFrom(this.http.put<LevelSetVersion>('/api/levels', { levels, reason }));
      this.ref.close(saved);
    } catch (err) {
      const controls = Object.fromEntries([...fields.map((f) => [`levels.${f.path}`, f.control] as const), ['reason', this.reason] as const]);
      this.problem.set(placeServerError(err, controls));
    } finally {
      this.sending.set(false);
    }
  }
}
