import { CURRENT_ADC, VOLTAGE_ADC, type AdcRange } from '../telemetry/adc.js';
import type { Axis } from '../telemetry/messages.js';

/**
 * Parameters of the simulated field-orientation controller. The demo values below describe the
 * fictional Lindqvist Hall apparatus (invented, demo only); a real controller has its own.
 */
export interface CoilParameters {
  /** Winding resistance at 20 °C, Ω. */
  r20Ohm: number;
  /** Winding inductance, H. */
  inductanceH: number;
  /** Lumped heat capacity of winding and former, J/K. */
  heatCapacityJPerK: number;
  /** Thermal conductance winding → cooling water at the nominal flow, W/K. */
  conductanceWPerK: number;
  /** Coolant flow through this coil pair with the valve open, L/min. */
  nominalFlowLpm: number;
}

export interface SupplyParameters {
  /** Largest |current| the supply regulates to, A. */
  currentLimitA: number;
  /** Largest rate of change of the current reference, A/s. */
  slewLimitAPerS: number;
  /** Largest |output voltage| (compliance), V. */
  complianceV: number;
}

/** Levels of the controller's own (hardware-like) trip chain. */
export interface HardwareTripLevels {
  /** Coil temperature above which the chain trips, °C. */
  overTemperatureC: number;
  /** Coolant flow below which the chain trips after `lowFlowDelayS`, L/min. */
  lowFlowLpm: number;
  /** A flow switch ignores dips shorter than this (pump transients), s. */
  lowFlowDelayS: number;
  /** |current| above which the chain trips at once, A. */
  overCurrentA: number;
}

/** Standard deviations of the measurement noise added to each reported channel. */
export interface NoiseParameters {
  currentA: number;
  voltageV: number;
  temperatureC: number;
  flowLpm: number;
}

/** The converters that digitise the fast channels (resolution and range of every sample). */
export interface AdcParameters {
  currentA: AdcRange;
  voltageV: AdcRange;
}

export interface ControllerParameters {
  coils: Record<Axis, CoilParameters>;
  /** Largest |B| the apparatus is built and rated for, G. */
  maxFieldG: number;
  /** Fast-channel converters: samples are reported as whole converter steps, clipped at full scale. */
  adc: AdcParameters;
  supply: SupplyParameters;
  trips: HardwareTripLevels;
  noise: NoiseParameters;
  /** Cooling-water supply temperature, °C. */
  waterSupplyC: number;
  /** Time constant with which the coolant flow follows its valve, s. */
  flowTimeConstantS: number;
  /** Time constant with which the water supply temperature follows the chiller, s. */
  chillerTimeConstantS: number;
}

const coil = (r20Ohm: number, nominalFlowLpm: number): CoilParameters => ({
  r20Ohm,
  inductanceH: 0.02,
  // ≈ 0.26 kg of copper-equivalent (c ≈ 385 J/(kg·K), from memory): with cooling lost at 10 A
  // (≈ 45 W) the winding heats by ≈ 0.45 K/s and passes the 65 °C software trip in 1–2 min.
  heatCapacityJPerK: 100,
  // Holds the winding ≈ 8 K above the water at 10 A and ≈ 37 K above it at 20 A.
  conductanceWPerK: 5,
  nominalFlowLpm,
});

/**
 * Demo apparatus. The hardware trip levels sit beyond the software trip levels of
 * `shared/live/channels.ts` (65 °C, 1.0 L/min, 20 A), as a hardware interlock should, and the
 * supply's own current limit (22 A) sits between the software trip and the hardware trip.
 */
export const DEMO_PARAMETERS: ControllerParameters = {
  coils: { x: coil(0.41, 3.2), y: coil(0.39, 3.0), z: coil(0.42, 2.8) },
  maxFieldG: 20,
  // 20-bit converters over ±25 A and ±25 V: one step is 47.7 µA / 47.7 µV (shared/telemetry/adc.ts).
  adc: { currentA: CURRENT_ADC, voltageV: VOLTAGE_ADC },
  supply: { currentLimitA: 22, slewLimitAPerS: 20, complianceV: 14 },
  trips: { overTemperatureC: 75, lowFlowLpm: 0.6, lowFlowDelayS: 2, overCurrentA: 24 },
  noise: { currentA: 0.002, voltageV: 0.005, temperatureC: 0.05, flowLpm: 0.02 },
  waterSupplyC: 18,
  flowTimeConstantS: 1.5,
  chillerTimeConstantS: 20,
};
