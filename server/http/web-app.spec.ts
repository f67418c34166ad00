import { mkdirSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import express from 'express';
import { afterEach, describe, expect, it } from 'vitest';
import { makeEmptyDir, removeDataDir } from '../testing/test-server.js';
import { securityHeaders } from './security-headers.js';
import { webApp } from './web-app.js';

describe('web app serving', () => {
  let server: Server | undefined;
  let dir: string | undefined;
  afterEach(async () => {
    await new Promise((resolve) => server?.close(resolve) ?? resolve(undefined));
    if (dir) removeDataDir(dir);
  });

  async function serve(webRoot: string): Promise<string> {
    const app = express();
    app.use(securityHeaders());
    app.use(webApp(webRoot));
    server = app.listen(0, '127.0.0.1');
    await new Promise((resolve) => server!.once('listening', resolve));
    return `http://127.0.0.1:${(server!.address() as AddressInfo).port}`;
  }

  it('answers deep links with index.html and serves static files', async () => {
    dir = makeEmptyDir();
    writeFileSync(path.join(dir, 'index.html'), '<!doctype html><title>Tiltwatch</title>');
    mkdirSync(path.join(dir, 'media'));
    writeFileSync(path.join(dir, 'media', 'app.js'), 'export {};');
    const url = await serve(dir);
    const deep = await fetch(`${url}/live/coil/x`);
    expect(deep.status).toBe(200);
    expect(await deep.text()).toContain('<title>Tiltwatch</title>');
    expect((await fetch(`${url}/media/app.js`)).headers.get('content-type')).toMatch(/javascript/);
  });

  it('says to run the build when the app has not been built', async () => {
    dir = makeEmptyDir();
    const res = await fetch(`${await serve(path.join(dir, 'missing'))}/`);
    expect(res.status).toBe(503);
    expect(await res.text()).toMatch(/run "npm run build"/);
  });

  it('sends a CSP that lets the WebSocket connect and does not push browsers to https', async () => {
    dir = makeEmptyDir();
    const res = await fetch(`${await serve(dir)}/`);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toMatch(/connect-src 'self' ws: wss:/);
    expect(csp).not.toMatch(/upgrade-insecure-requests/);
    expect(res.headers.get('strict-transport-security')).toBeNull();
  });
});
