/**
 * Winding temperature from the winding's resistance, R = V/I, against its resistance at
 * 20 °C: R(T) = R20·(1 + α20·(T − 20 °C)), so T = 20 °C + (R/R20 − 1)/α20 (the resistance
 * method of measuring winding temperature; docs/physics.md). It is a mean over the whole
 * winding, so it can run ahead of a sensor on its surface.
 */

import { COPPER_ALPHA_PER_K, REFERENCE_TEMPERATURE_C } from '../apparatus/coil-model.js';

/** Below this |I| the voltage is mostly offset and noise; no temperature is derived, A. */
export const MIN_CURRENT_FOR_RESISTANCE_A = 1;
/** While the current still moves towards its setpoint by more than this, L·dI/dt spoils V/I, A. */
export const MAX_SETTLING_DEVIATION_A = 0.05;

/**
 * The winding temperature in °C, or null when it cannot be derived honestly: too little
 * current, a ramp in progress (setpoint and current apart), or inputs missing.
 */
export function windingTemperatureC(voltageV: number | null, currentA: number | null, setpointA: number | null, r20Ohm: number): number | null {
  if (voltageV === null || currentA === null || !Number.isFinite(voltageV) || !Number.isFinite(currentA)) return null;
  if (Math.abs(currentA) < MIN_CURRENT_FOR_RESISTANCE_A || !(r20Ohm > 0)) return null;
  if (setpointA !== null && Math.abs(setpointA - currentA) > MAX_SETTLING_DEVIATION_A) return null;
  const resistance = voltageV / currentA;
  return REFERENCE_TEMPERATURE_C + (resistance / r20Ohm - 1) / COPPER_ALPHA_PER_K;
}
