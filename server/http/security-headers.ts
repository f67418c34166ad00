import type { RequestHandler } from 'express';
import helmet from 'helmet';

/**
 * helmet with a Content-Security-Policy fitted to the Angular app: the WebSocket may connect
 * to this host; no `upgrade-insecure-requests` and no HSTS, because the server speaks plain
 * HTTP and either would send browsers to an https address that does not answer (a blank
 * page). Put TLS in front (a reverse proxy) to serve over https.
 */
export function securityHeaders(): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: true,
      directives: {
        'default-src': ["'self'"],
        'connect-src': ["'self'", 'ws:', 'wss:'],
        'img-src': ["'self'", 'data:', 'blob:'],
        'font-src': ["'self'", 'data:'],
        // Angular adds component styles as <style> elements.
        'style-src': ["'self'", "'unsafe-inline'"],
        'script-src': ["'self'"],
        'upgrade-insecure-requests': null,
      },
    },
    strictTransportSecurity: false,
  });
}
