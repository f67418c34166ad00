import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { fermiEnergyNanoKelvin, sampleScales } from '../../../shared/physics/sample';
import { SPECIES } from '../../../shared/physics/species';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import { sampleParamsOf, type SampleProfile } from '../../../shared/profiles/sample-profile';
import { cameraAxes } from '../prediction/camera-axes';
import { formatLocalDateTime, formatNumber, formatQuantity } from '../readout/format-quantity';

/** One stored sample-profile version, read-only, with the scales the model derives from it. */
@Component({
  selector: 'tw-profile-details',
  imports: [MatIconModule],
  templateUrl: './profile-details.html',
  styleUrl: './profile-details.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfileDetails {
  readonly record = input.required<ProfileRecord>();

  protected readonly rows = computed(() => {
    const { profile } = this.record();
    const euler = profile.trapToCoilEulerDeg;
    return [
      { label: 'Species', value: speciesText(profile) },
      ...(profile.polarization !== undefined ? [{ label: 'Polarisation (lab frame)', value: formatNumber(profile.polarization, 2) }] : []),
      { label: 'Atom number', value: new Intl.NumberFormat(undefined, { maximumSignificantDigits: 6 }).format(profile.atomNumber) },
      { label: 'Trap frequencies x, y, z', value: profile.trapHz.map((f) => formatQuantity(f, 'Hz', 1)).join(', ') },
      {
        label: 'Trap axes in the coil frame (z-y-z)',
        value: euler ? `${euler.map((a) => formatQuantity(a, '°', 1)).join(', ')} (about coil z, new y, new z)` : 'same as the coil axes',
      },
      { label: 'TOF times', value: `${profile.tofMs.map((t) => formatNumber(t, 1)).join(', ')}\u00a0ms (first shown live)` },
      { label: 'Camera', value: cameraAxes(profile.imaging)?.label ?? '—' },
    ];
  });

  /** ε_dd and the ideal-gas Fermi energy, or why they cannot be derived. */
  protected readonly scales = computed(() => {
    try {
      const scales = sampleScales(sampleParamsOf(this.record().profile));
      return { epsDd: formatNumber(scales.epsDd, 3), fermiEnergy: formatQuantity(fermiEnergyNanoKelvin(scales), 'nK', 0), error: null };
    } catch (err) {
      return { epsDd: '—', fermiEnergy: '—', error: err instanceof Error ? err.message : String(err) };
    }
  });

  protected readonly created = computed(() => {
    const at = Date.parse(this.record().createdAt);
    return Number.isFinite(at) ? formatLocalDateTime(at) : this.record().createdAt;
  });
}

function speciesText(profile: SampleProfile): string {
  const species = profile.species;
  if (typeof species === 'string') {
    const entry = SPECIES[species];
    if (!entry) return species;
    const moment = entry.magneticMomentMuB !== undefined ? `${entry.magneticMomentMuB} μB` : `${entry.dipoleDebye} D`;
    return `${species} (${formatNumber(entry.massU, 3)} u, ${moment})`;
  }
  const moment = 'magneticMomentMuB' in species ? `${species.magneticMomentMuB} μB` : `${species.dipoleDebye} D`;
  return `${species.name ?? 'custom'} (${species.massU} u, ${moment})`;
}
