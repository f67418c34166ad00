import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal, type OnInit } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { SPECIES } from '../../../shared/physics/species';
import type { ProfileRecord, ProfileSaveRequest } from '../../../shared/profiles/profile-record';
import { PROFILE_RANGES, type SampleProfile } from '../../../shared/profiles/sample-profile';
import { errorField, errorText } from '../api/error-text';
import { CUSTOM_ELECTRIC, CUSTOM_MAGNETIC, DRAFT_FIELDS, draftFromProfile, fieldOfPath, isElectricSpecies, profileFromDraft, type DraftField, type ProfileDraft } from './profile-draft';

type DraftControls = { [K in DraftField]: FormControl<string> };

const SPECIES_OPTIONS = [
  ...Object.entries(SPECIES).map(([key, entry]) => ({
    value: key,
    label: entry.magneticMomentMuB !== undefined ? `${key} · ${entry.magneticMomentMuB} μB` : `${key} · ${entry.dipoleDebye} D (molecule)`,
  })),
  { value: CUSTOM_MAGNETIC, label: 'Custom: mass and magnetic moment' },
  { value: CUSTOM_ELECTRIC, label: 'Custom: mass and electric dipole' },
];

/**
 * Form for a new sample-profile version (lead and above): starts from the profile shown,
 * validates with the shared profile schema before sending, requires a reason for the audit
 * trail, and shows the server's own words when it refuses.
 */
@Component({
  selector: 'tw-profile-form',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
  templateUrl: './profile-form.html',
  styleUrl: './profile-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfileForm implements OnInit {
  private readonly http = inject(HttpClient);

  /** The profile the new version starts from. */
  readonly start = input.required<SampleProfile>();
  /** Heading, e.g. "New version of …" or "New profile". */
  readonly heading = input.required<string>();
  readonly saved = output<ProfileRecord>();
  readonly closed = output<void>();

  protected readonly speciesOptions = SPECIES_OPTIONS;
  protected readonly form = new FormGroup({
    ...(Object.fromEntries(DRAFT_FIELDS.map((key) => [key, new FormControl('', { nonNullable: true })])) as DraftControls),
    reason: new FormControl('', { nonNullable: true }),
  });
  protected readonly ranges = PROFILE_RANGES;

  private readonly species = toSignal(this.form.controls.species.valueChanges, { initialValue: '' });
  private readonly imaging = toSignal(this.form.controls.imaging.valueChanges, { initialValue: '' });
  protected readonly customSpecies = computed(() => this.species() === CUSTOM_MAGNETIC || this.species() === CUSTOM_ELECTRIC);
  protected readonly magnetic = computed(() => this.species() === CUSTOM_MAGNETIC);
  protected readonly electric = computed(() => isElectricSpecies(this.species()));
  protected readonly customImaging = computed(() => this.imaging() === 'custom');

  /** Problems that belong to no single field, and the server's refusal. */
  protected readonly generalProblems = signal<string[]>([]);
  protected readonly serverError = signal<string | null>(null);
  protected readonly saving = signal(false);

  ngOnInit(): void {
    this.form.patchValue(draftFromProfile(this.start()));
  }

  /** Message of a field's problem, for its mat-error. */
  protected problem(field: DraftField | 'reason'): string | null {
    return (this.form.controls[field].getError('problem') as string | undefined) ?? null;
  }

  protected async save(): Promise<void> {
    this.serverError.set(null);
    const { reason, ...draft } = this.form.getRawValue();
    const result = profileFromDraft(draft as ProfileDraft);
    const problems = result.problems ?? { fields: {}, general: [] };
    if (!reason.trim()) (problems.fields as Record<string, string>)['reason'] = 'Give a reason for this version; it goes into the audit trail.';
    for (const [field, message] of Object.entries(problems.fields) as [DraftField | 'reason', string][]) {
      this.form.controls[field].setErrors({ problem: message });
    }
    this.form.markAllAsTouched();
    this.generalProblems.set(problems.general);
    if (!result.profile || !reason.trim()) return;

    const body: ProfileSaveRequest = { profile: result.profile, reason: reason.trim() };
    this.saving.set(true);
    try {
      this.saved.emit(await firstValueFrom(this.http.post<ProfileRecord>('/api/profiles', body)));
    } catch (err) {
      // A refusal that names an input goes next to it; anything else under the form.
      const path = errorField(err)?.replace(/^profile\./, '').split('.') ?? [];
      const field = path[0] === 'reason' ? 'reason' : fieldOfPath(path);
      if (field) {
        this.form.controls[field].setErrors({ problem: errorText(err) });
        this.form.controls[field].markAsTouched();
      } else {
        this.serverError.set(errorText(err));
      }
    } finally {
      this.saving.set(false);
    }
  }

  protected close(): void {
    this.closed.emit();
  }
}
