import { pino, type Logger } from 'pino';
import type { LogLevel } from '../config.js';

/** The server's structured log: JSON lines on stdout at `level`. */
export function createLogger(level: LogLevel): Logger {
  return pino({ name: 'tiltwatch', level });
}
