import type { SupplyParameters } from '../shared/apparatus/coil-data.js';

/** How a failed regulator drives its output: the output voltage climbs at `voltsPerSecond` (V/s). */
export interface RunawayDrive {
  voltsPerSecond: number;
}

/**
 * A bipolar coil supply with a simple regulator.
 *
 * Model: the setpoint passes a current limit (clamped to ±`currentLimitA`) and a slew limit
 * (the internal reference moves towards it by at most `slewLimitAPerS`·dt per step). The
 * regulator then sets the output voltage that holds the reference in steady state,
 * V = R(T)·I_ref, using the winding resistance it measures, clamped to ±`complianceV`. The
 * current therefore follows the reference through the coil's own first-order dynamics with
 * τ = L/R and settles exactly on the setpoint even as the winding warms. There is no inductive
 * feed-forward (L·dI_ref/dt), so the current lags a ramping reference by about τ.
 *
 * A runaway regulator ignores the reference and its current limit: its voltage climbs from its
 * last value until the compliance. Only the hardware trip (`disabled`) stops it, by taking the
 * output away from the regulator and ramping the reference to zero.
 */
export class Supply {
  /** Slewed current reference, A. */
  referenceA = 0;
  /** Last output voltage, V. */
  outputV = 0;
  private runawayV: number | null = null;

  constructor(private readonly params: SupplyParameters) {}

  /**
   * Advances the regulator by `dtS` seconds towards `setpointA` (A) for a winding of
   * `resistanceOhm` (Ω) and returns the output voltage (V) to apply over the step.
   */
  step(setpointA: number, resistanceOhm: number, dtS: number, runaway: RunawayDrive | null, disabled: boolean): number {
    const { currentLimitA, slewLimitAPerS, complianceV } = this.params;
    const limit = (a: number) => Math.max(-currentLimitA, Math.min(currentLimitA, a));
    if (runaway && !disabled) {
      const start = this.runawayV ?? this.outputV;
      this.runawayV = start + (start < 0 ? -1 : 1) * runaway.voltsPerSecond * dtS;
      this.outputV = clamp(this.runawayV, complianceV);
      return this.outputV;
    }
    if (this.runawayV !== null) {
      // Regulation resumes from the present output, not with a jump back to the old reference.
      this.referenceA = limit(this.outputV / resistanceOhm);
      this.runawayV = null;
    }
    const maxStep = slewLimitAPerS * dtS;
    const target = disabled ? 0 : limit(setpointA);
    this.referenceA += Math.max(-maxStep, Math.min(maxStep, target - this.referenceA));
    this.outputV = clamp(resistanceOhm * this.referenceA, complianceV);
    return this.outputV;
  }
}

function clamp(value: number, limit: number): number {
  return Math.max(-limit, Math.min(limit, value));
}
