import type { RequestHandler } from 'express';
import type { Logger } from 'pino';

/** Logs each finished request with method, path, status and duration (ms) at debug level. */
export function requestLogger(log: Logger): RequestHandler {
  return (req, res, next) => {
    const start = performance.now();
    res.on('finish', () => {
      log.debug(
        { method: req.method, url: req.originalUrl.split('?')[0], status: res.statusCode, ms: Math.round(performance.now() - start) },
        'request',
      );
    });
    next();
  };
}
