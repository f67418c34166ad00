/**
 * The sentences that say why the prediction does not describe the gas, shared by the server's
 * live status (server/prediction/prediction-status.ts) and the Replay page, which words a
 * recorded status at its own clock the same way.
 */

/** No telemetry arrived for `ageMs`. */
export function staleReason(ageMs: number): string {
  const age = ageMs < 10_000 ? `${(ageMs / 1000).toFixed(1)} s` : `${Math.round(ageMs / 1000)} s`;
  return `No telemetry for ${age}: the field now is unknown, so the prediction may not describe the gas.`;
}

/** |B| = `fieldG` is below the least field that orients the dipoles, `minFieldG`. */
export function weakFieldReason(fieldG: number, minFieldG: number): string {
  return `|B| = ${fieldG.toFixed(2)} G is below ${minFieldG.toFixed(2)} G, too weak to orient the dipoles: the prediction does not apply.`;
}
