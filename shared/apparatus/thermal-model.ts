/**
 * Thermal model of one water-cooled coil pair: a lumped winding of heat capacity C heated by
 * P = I²R and cooled by water flowing through it. Losses to the room air are neglected next to
 * the water cooling.
 *
 * The water channel is treated as a heat exchanger with an isothermal wall (the winding): with
 * conductance G and capacity rate ṁ·c_p its effectiveness is ε = 1 − exp(−G/(ṁ·c_p)) (the
 * NTU method for a single stream, common practice), the heat taken up is
 * Q = ε·ṁ·c_p·(T_coil − T_supply) and the return water is T_return = T_supply + Q/(ṁ·c_p).
 * In steady state Q = P, so T_return − T_supply = P/(ṁ·c_p): the plain energy balance.
 * The water itself carries no heat capacity in the model (it passes in well under a second).
 *
 * G scales with flow as flow^0.8 (turbulent forced convection, Dittus–Boelter exponent, from
 * memory), so a failing pump also worsens the heat transfer, and no flow means no cooling.
 */

/** Specific heat capacity of liquid water at 25 °C, J/(kg·K) (from memory; CRC Handbook value 4.181 J/(g·K)). */
export const WATER_CP_J_PER_KG_K = 4181;
/** Density of liquid water at 25 °C, kg/L (from memory; 0.99705 g/cm³). */
export const WATER_DENSITY_KG_PER_L = 0.99705;
/** Exponent of the flow dependence of the coil → water conductance (Dittus–Boelter, from memory). */
export const CONVECTION_FLOW_EXPONENT = 0.8;

/** Heat capacity rate ṁ·c_p (W/K) of a water flow of `flowLpm` L/min. */
export function waterCapacityRate(flowLpm: number): number {
  return (Math.max(0, flowLpm) / 60) * WATER_DENSITY_KG_PER_L * WATER_CP_J_PER_KG_K;
}

/** Coil → water conductance (W/K) at `flowLpm`, given `nominalWPerK` at `nominalFlowLpm` (both L/min). */
export function conductanceAtFlow(nominalWPerK: number, nominalFlowLpm: number, flowLpm: number): number {
  if (flowLpm <= 0) return 0;
  return nominalWPerK * Math.pow(flowLpm / nominalFlowLpm, CONVECTION_FLOW_EXPONENT);
}

/**
 * Cooling coefficient k = ε·ṁ·c_p (W/K): heat to the water per kelvin of winding temperature
 * above the supply water, at `flowLpm` (L/min) and conductance `conductanceWPerK` (W/K).
 */
export function coolingCoefficient(flowLpm: number, conductanceWPerK: number): number {
  const capacityRate = waterCapacityRate(flowLpm);
  return capacityRate > 0 ? (1 - Math.exp(-conductanceWPerK / capacityRate)) * capacityRate : 0;
}

export interface CoolingState {
  /** Heat taken up by the water, W. */
  heatToWaterW: number;
  /** Return water temperature, °C. */
  returnC: number;
}

/**
 * Heat flow to the water (W) and return temperature (°C) for a winding at `coilC` (°C), water
 * supplied at `supplyC` (°C) with `flowLpm` (L/min), and conductance `conductanceWPerK` (W/K).
 * With no flow the standing water takes the winding's temperature and carries nothing away.
 */
export function cooling(coilC: number, supplyC: number, flowLpm: number, conductanceWPerK: number): CoolingState {
  const capacityRate = waterCapacityRate(flowLpm);
  if (capacityRate <= 0) return { heatToWaterW: 0, returnC: coilC };
  const heatToWaterW = coolingCoefficient(flowLpm, conductanceWPerK) * (coilC - supplyC);
  return { heatToWaterW, returnC: supplyC + heatToWaterW / capacityRate };
}

/**
 * Winding temperature (°C) after `dtS` seconds of heating with `powerW` (W) against the cooling
 * at `flowLpm`, for heat capacity `heatCapacityJPerK` (J/K). Over one step the cooling is
 * linear in T_coil (Q = k·(T − T_supply)), so the exact exponential solution is used; it stays
 * stable for the large steps a thermal speed-up makes.
 */
export function coilTemperatureAfter(
  coilC: number,
  powerW: number,
  supplyC: number,
  flowLpm: number,
  conductanceWPerK: number,
  heatCapacityJPerK: number,
  dtS: number,
): number {
  const k = coolingCoefficient(flowLpm, conductanceWPerK);
  if (k === 0) return coilC + (powerW * dtS) / heatCapacityJPerK;
  const steady = supplyC + powerW / k;
  return steady + (coilC - steady) * Math.exp((-k * dtS) / heatCapacityJPerK);
}

/**
 * Steady winding temperature (°C) for a constant current `currentA` (A) through a winding of
 * `r20Ohm` (Ω at 20 °C, copper temperature coefficient `alphaPerK`), cooled by water at
 * `supplyC` (°C) and `flowLpm` (L/min) through conductance `conductanceWPerK` (W/K at that flow).
 * In steady state the ohmic heat equals the cooling: I²·R20·(1 + α(T − 20 °C)) = k·(T − T_supply),
 * which is linear in T. Infinity when the cooling cannot keep up at any temperature (no flow,
 * or I²·R20·α ≥ k: thermal runaway).
 */
export function steadyCoilTemperature(
  currentA: number,
  r20Ohm: number,
  alphaPerK: number,
  supplyC: number,
  flowLpm: number,
  conductanceWPerK: number,
): number {
  const k = coolingCoefficient(flowLpm, conductanceWPerK);
  const p20 = currentA * currentA * r20Ohm;
  if (p20 === 0) return supplyC;
  const denominator = k - p20 * alphaPerK;
  if (!(denominator > 0)) return Infinity;
  return (k * supplyC + p20 * (1 - 20 * alphaPerK)) / denominator;
}
