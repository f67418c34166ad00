/**
 * The imaging analysis of the fictional Lindqvist Hall lab (invented, demo only). Its
 * "measured" aspect ratios are made up: 65 % of the predicted deformation (docs/physics.md
 * §6.2: measured deformations are expected to be smaller) with a small fixed scatter,
 * σ = 0.002. `demo-imaging-cli.ts` writes its file for a run of a running demo server.
 */
import { MEASUREMENT_COLUMNS, type ShotRow } from '../../../shared/shots/shots-api.js';

/** Share of the predicted deformation the invented measurements show. */
const DEMO_SHARE = 0.65;
const DEMO_SIGMA = 0.002;

/** The invented measurement file for `shots` (those without a predicted TOF image are skipped). */
export function demoMeasurementCsv(shots: readonly ShotRow[]): string {
  const lines = shots
    .filter((s) => s.prediction?.tofAspect != null)
    .map((s, i) => {
      // A fixed, repeatable scatter of about ±1.5 σ.
      const scatter = 1.5 * DEMO_SIGMA * Math.sin(2.4 * i + 1);
      const aspect = Math.max(1, 1 + DEMO_SHARE * (s.prediction!.tofAspect! - 1) + scatter);
      const angle = (s.prediction!.tofMajorAngleDeg ?? 0) + 2 * Math.cos(1.7 * i);
      return `${s.id},${aspect.toFixed(5)},${angle.toFixed(1)},${DEMO_SIGMA}`;
    });
  return [MEASUREMENT_COLUMNS.join(','), ...lines].join('\n') + '\n';
}
