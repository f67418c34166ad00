/**
 * A non-physical or malformed input to the model (N ≤ 0, a bad trap frequency, an unknown
 * species, a zero field vector, …). The message names the input and says what to fix, so a
 * command line or an API layer can show it as it is.
 */
export class PhysicsInputError extends Error {
  override readonly name = 'PhysicsInputError';
}
