/**
 * Electrical model of one coil pair: a winding of resistance R(T) and inductance L driven by a
 * voltage V, so L·dI/dt = V − R·I (first-order response with time constant τ = L/R).
 */

/** Temperature coefficient of resistance of annealed copper at 20 °C, 1/K (IEC 60028). */
export const COPPER_ALPHA_PER_K = 0.00393;
/** Reference temperature of `COPPER_ALPHA_PER_K` and of every R20, °C. */
export const REFERENCE_TEMPERATURE_C = 20;

/** Winding resistance (Ω) at `temperatureC` (°C) from its value at 20 °C: R20·(1 + α(T − 20 °C)). */
export function resistanceAt(r20Ohm: number, temperatureC: number): number {
  return r20Ohm * (1 + COPPER_ALPHA_PER_K * (temperatureC - REFERENCE_TEMPERATURE_C));
}

/**
 * Current (A) after `dtS` seconds when the voltage `voltageV` (V) and resistance `resistanceOhm`
 * (Ω) are held constant over the step, starting from `currentA` (A), with inductance
 * `inductanceH` (H). Uses the exact solution of the linear ODE rather than an Euler step, so
 * the response has the right time constant whatever the step size.
 */
export function coilCurrentAfter(
  currentA: number,
  voltageV: number,
  resistanceOhm: number,
  inductanceH: number,
  dtS: number,
): number {
  const final = voltageV / resistanceOhm;
  return final + (currentA - final) * Math.exp((-resistanceOhm * dtS) / inductanceH);
}
