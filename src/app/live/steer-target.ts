import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { FieldState } from '../../../shared/field/field-vector';
import { centralAngleDeg } from '../../../shared/steering/great-circle';
import { targetVector } from '../../../shared/steering/target';
import { formatQuantity } from '../readout/format-quantity';
import { SteeringWatch } from '../steering/steering-watch';

/**
 * While something steers the field: the target beside the measured angles and the angle
 * between them. Hidden while nothing steers.
 */
@Component({
  selector: 'tw-steer-target',
  imports: [MatIconModule, RouterLink],
  providers: [SteeringWatch],
  template: `
    @if (target(); as t) {
      <p class="line" role="status">
        <mat-icon aria-hidden="true" inline>navigation</mat-icon>
        <strong>{{ mode() }}</strong>
        <span>target |B| {{ q(t.magnitudeG, 'G', 2) }}, θ {{ q(t.thetaDeg, '°', 1) }}, φ {{ q(t.phiDeg, '°', 1) }}</span>
        <span class="measured">measured |B| {{ q(field()?.magnitude, 'G', 2) }}, θ {{ q(field()?.thetaDeg, '°', 1) }}, φ {{ q(field()?.phiDeg, '°', 1) }}</span>
        @if (offDeg(); as off) {
          <span>direction off target by {{ q(off, '°', 1) }}</span>
        }
        <a routerLink="/steer">Steer</a>
      </p>
    }
  `,
  styles: `
    .line {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 14px;
      margin: 0;
      padding: 8px 14px;
      border-radius: 10px;
      border: 1px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container);
      font: var(--mat-sys-body-large);
      font-variant-numeric: tabular-nums;
    }
    .measured {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SteerTarget {
  readonly field = input<FieldState | null>(null);
  private readonly watch = inject(SteeringWatch);

  protected readonly target = computed(() => {
    const s = this.watch.status();
    return s && s.mode !== 'idle' ? s.target : null;
  });
  protected readonly mode = computed(() => (this.watch.status()?.mode === 'ramping' ? 'Ramping' : 'Holding'));
  protected readonly offDeg = computed(() => {
    const t = this.target();
    const f = this.field();
    if (!t || !f || f.magnitude === 0 || t.magnitudeG === 0) return null;
    return centralAngleDeg(f.vector, targetVector(t));
  });

  protected q(v: number | null | undefined, unit: string, digits: number): string {
    return formatQuantity(v, unit, digits);
  }
}
