import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import { hasRole } from '../../../shared/auth/roles';
import { DEMO_PROFILE } from '../../../shared/profiles/demo-profile';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import type { SampleProfile } from '../../../shared/profiles/sample-profile';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { formatLocalDateTime } from '../readout/format-quantity';
import { ActiveProfile } from './active-profile';
import { ProfileDetails } from './profile-details';
import { ProfileForm } from './profile-form';

/** What the right-hand side shows. */
type Editing = { kind: 'version'; from: ProfileRecord } | { kind: 'new' } | null;

/**
 * The Sample profiles page: every stored version, the active one marked; a version's details;
 * and, for the lead and above only, new versions and activation (each with a reason). Other
 * roles are not offered these controls at all.
 */
@Component({
  selector: 'tw-profiles-page',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, ProfileDetails, ProfileForm],
  templateUrl: './profiles-page.html',
  styleUrl: './profiles-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfilesPage {
  private readonly http = inject(HttpClient);
  private readonly session = inject(Session);
  private readonly activeProfile = inject(ActiveProfile);

  protected readonly list = httpResource<{ profiles: ProfileRecord[] }>(() => '/api/profiles');
  protected readonly listError = computed(() => (this.list.error() ? errorText(this.list.error()) : null));

  /** May write profile versions and choose the active one. */
  protected readonly canEdit = computed(() => {
    const role = this.session.role();
    return role !== null && hasRole(role, 'lead');
  });

  /** Versions grouped by name (the active profile's name first), newest version first. */
  protected readonly groups = computed(() => {
    const profiles = this.list.hasValue() ? this.list.value().profiles : [];
    const byName = new Map<string, ProfileRecord[]>();
    for (const record of profiles) byName.set(record.name, [...(byName.get(record.name) ?? []), record]);
    return [...byName.entries()]
      .map(([name, versions]) => ({ name, versions: versions.sort((a, b) => b.version - a.version), active: versions.some((v) => v.active) }))
      .sort((a, b) => Number(b.active) - Number(a.active) || a.name.localeCompare(b.name));
  });

  private readonly chosenId = signal<number | null>(null);
  /** The version shown: the one chosen, else the active one, else the first. */
  protected readonly selected = computed<ProfileRecord | null>(() => {
    const all = this.groups().flatMap((g) => g.versions);
    return all.find((r) => r.id === this.chosenId()) ?? all.find((r) => r.active) ?? all[0] ?? null;
  });

  protected readonly editing = signal<Editing>(null);
  protected readonly formStart = computed<SampleProfile>(() => {
    const editing = this.editing();
    return editing?.kind === 'version' ? editing.from.profile : { ...DEMO_PROFILE, name: '' };
  });
  protected readonly formHeading = computed(() => {
    const editing = this.editing();
    return editing?.kind === 'version' ? `New version of “${editing.from.name}” (from v${editing.from.version})` : 'New profile';
  });

  protected readonly activating = signal(false);
  protected activationReason = '';
  protected readonly activationError = signal<string | null>(null);
  protected readonly notice = signal<string | null>(null);

  /** Local date and time a version was written. */
  protected writtenAt(record: ProfileRecord): string {
    const at = Date.parse(record.createdAt);
    return Number.isFinite(at) ? formatLocalDateTime(at) : record.createdAt;
  }

  protected select(record: ProfileRecord): void {
    this.chosenId.set(record.id);
    this.editing.set(null);
    this.activating.set(false);
    this.notice.set(null);
  }

  protected startVersion(from: ProfileRecord): void {
    this.notice.set(null);
    this.editing.set({ kind: 'version', from });
  }

  protected startNew(): void {
    this.notice.set(null);
    this.editing.set({ kind: 'new' });
  }

  protected stopEditing(): void {
    this.editing.set(null);
  }

  protected afterSave(record: ProfileRecord): void {
    this.editing.set(null);
    this.chosenId.set(record.id);
    this.notice.set(`Saved ${record.name} v${record.version} as a draft: it is not active. Activate it when the running gas matches it.`);
    this.list.reload();
  }

  protected startActivation(): void {
    this.activationReason = '';
    this.activationError.set(null);
    this.activating.set(true);
  }

  protected async activate(record: ProfileRecord): Promise<void> {
    const reason = this.activationReason.trim();
    if (!reason) {
      this.activationError.set('Give a reason for activating this version; it goes into the audit trail.');
      return;
    }
    this.activationError.set(null);
    try {
      const updated = await firstValueFrom(this.http.post<ProfileRecord>(`/api/profiles/${record.id}/activate`, { reason }));
      this.activating.set(false);
      this.notice.set(`${updated.name} v${updated.version} is now the active profile. The live prediction follows it.`);
      this.list.reload();
      this.activeProfile.reload();
    } catch (err) {
      this.activationError.set(`The server did not activate it: ${errorText(err)}`);
    }
  }
}
