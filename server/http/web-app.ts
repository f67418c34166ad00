import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Router } from 'express';

/**
 * Serves the built Angular app from `webRoot` with a single-page-app fallback (any other GET
 * answers index.html so deep links work). Before `npm run build` has run, `/` explains that.
 */
export function webApp(webRoot: string): Router {
  const router = express.Router();
  const index = path.join(webRoot, 'index.html');
  router.use(express.static(webRoot, { index: false, maxAge: '1h' }));
  router.get('/{*splat}', (_req, res) => {
    if (!existsSync(index)) {
      res.status(503).type('text/plain').send(`The web app is not built yet: run "npm run build" (expected ${index}). The API answers under /api.\n`);
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return router;
}
