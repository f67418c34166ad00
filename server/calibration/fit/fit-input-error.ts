/**
 * A calibration file or option that cannot be fitted: the message names the file line
 * (header = line 1) and the column where there is one, and says what to fix, so the command
 * line and the API show it as it is. Nothing is stored from a refused file.
 */
export class CalibrationInputError extends Error {
  override readonly name = 'CalibrationInputError';
}
