import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:http';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { CONTENT_SECURITY_POLICY, handler } from '../../src/cli/serve.mjs';

/** The `npm start` server without a browser: headers, MIME types, paths outside the app. */
describe('the app server', () => {
  let server: Server;
  let base = '';
  beforeAll(async () => {
    const root = mkdtempSync(join(tmpdir(), 'lacuna-serve-'));
    mkdirSync(join(root, 'demo'));
    writeFileSync(join(root, 'index.html'), '<!doctype html><title>t</title>');
    writeFileSync(join(root, 'demo', 'x.cif'), 'data_x\n');
    writeFileSync(join(root, 'demo', 'x.cif.gz'), gzipSync('data_x\n'));
    writeFileSync(join(root, 'app.js'), 'export {};');
    writeFileSync(join(tmpdir(), 'lacuna-serve-secret.txt'), 'outside');
    server = createServer(handler(root));
    await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok));
    base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
  });
  afterAll(() => new Promise<void>((ok) => server.close(() => ok())));

  it('sends the strict policy and the right types', async () => {
    const cases: Array<[string, string]> = [['/', 'text/html'], ['/app.js', 'text/javascript'], ['/demo/x.cif', 'chemical/x-cif'], ['/demo/x.cif.gz', 'application/gzip']];
    for (const [path, type] of cases) {
      const r = await fetch(base + path);
      expect(r.status, path).toBe(200);
      expect(r.headers.get('content-type'), path).toContain(type);
      expect(r.headers.get('content-security-policy'), path).toBe(CONTENT_SECURITY_POLICY);
      expect(r.headers.get('content-encoding'), path).toBeNull(); // .gz arrives as bytes; the app unpacks it
    }
    expect(CONTENT_SECURITY_POLICY).toMatch(/script-src 'self';/);
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/unsafe/);
  });

  it('serves nothing outside the app folder and only reads', async () => {
    for (const path of ['/../lacuna-serve-secret.txt', '/%2e%2e/lacuna-serve-secret.txt', '/demo/%2e%2e/%2e%2e/lacuna-serve-secret.txt']) {
      const r = await fetch(base + path);
      expect([403, 404], path).toContain(r.status);
      expect(await r.text(), path).not.toContain('outside');
    }
    expect((await fetch(base + '/missing.cif')).status).toBe(404);
    expect((await fetch(base + '/', { method: 'POST', body: 'x' })).status).toBe(405);
  });
});
