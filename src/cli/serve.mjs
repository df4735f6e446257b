#!/usr/bin/env node
// `npm start`: build the web app when dist/app is missing or older than its
// sources, then serve dist/app on http://localhost:${PORT:-5173}/ with a
// strict Content-Security-Policy (no inline script, no eval). Plain node:http,
// no dependencies; also imported by the browser tests (startServer).
import { createServer } from 'node:http';
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync, createReadStream } from 'node:fs';
import { dirname, extname, join, normalize, resolve, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const REPO = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const APP_DIR = resolve(REPO, 'dist/app');

/** Every page and file gets these; the app needs nothing inline and nothing from elsewhere. */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:",
  "connect-src 'self'",
  "worker-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

const MIME = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
  '.md': 'text/plain; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.tsv': 'text/tab-separated-values; charset=utf-8',
  '.hkl': 'text/plain; charset=utf-8',
  // CIF has the registered-by-use type chemical/x-cif; mmCIF likewise.
  '.cif': 'chemical/x-cif',
  '.mmcif': 'chemical/x-mmcif',
  // Served as bytes (no Content-Encoding), so the app sees the gzip stream and unpacks it itself.
  '.gz': 'application/gzip',
};

export function mimeType(path) {
  return MIME[extname(path).toLowerCase()] ?? 'application/octet-stream';
}

function newestMtime(path) {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let t = st.mtimeMs;
  for (const e of readdirSync(path)) {
    if (e === 'node_modules' || e.startsWith('.')) continue;
    t = Math.max(t, newestMtime(join(path, e)));
  }
  return t;
}

/** True when dist/app is missing or older than any source the app is built from. */
export function appIsStale() {
  const built = resolve(APP_DIR, 'index.html');
  if (!existsSync(built)) return true;
  const builtAt = statSync(built).mtimeMs;
  const sources = ['src', 'shaders-free-render', 'public', 'vite.config.ts', 'package.json'].map((p) => resolve(REPO, p));
  return sources.some((p) => newestMtime(p) > builtAt);
}

/** Builds the app with vite; throws with vite's exit status on failure. */
export function buildApp(log = (s) => process.stderr.write(s)) {
  log('lacuna: building the web app (dist/app) ...\n');
  const vite = resolve(REPO, 'node_modules/vite/bin/vite.js');
  if (!existsSync(vite)) throw new Error('vite is not installed: run `npm ci` in the project folder first');
  const r = spawnSync(process.execPath, [vite, 'build', '--logLevel', 'warn'], { cwd: REPO, stdio: ['ignore', 'inherit', 'inherit'] });
  if (r.status !== 0) throw new Error(`building the web app failed (vite exit status ${r.status})`);
}

function send(res, status, type, body) {
  res.writeHead(status, { 'Content-Type': type, 'Content-Security-Policy': CONTENT_SECURITY_POLICY, 'X-Content-Type-Options': 'nosniff', 'Cache-Control': 'no-cache' });
  res.end(body);
}

export function handler(root = APP_DIR) {
  return (req, res) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') return send(res, 405, 'text/plain; charset=utf-8', 'method not allowed\n');
    let path;
    try {
      path = decodeURIComponent(new URL(req.url ?? '/', 'http://localhost').pathname);
    } catch {
      return send(res, 400, 'text/plain; charset=utf-8', 'bad request\n');
    }
    if (path.endsWith('/')) path += 'index.html';
    const file = normalize(join(root, path));
    if (file !== root && !file.startsWith(root + sep)) return send(res, 403, 'text/plain; charset=utf-8', 'forbidden\n');
    if (!existsSync(file) || !statSync(file).isFile()) return send(res, 404, 'text/plain; charset=utf-8', `not found: ${path}\n`);
    const st = statSync(file);
    res.writeHead(200, {
      'Content-Type': mimeType(file),
      'Content-Length': st.size,
      'Content-Security-Policy': CONTENT_SECURITY_POLICY,
      'X-Content-Type-Options': 'nosniff',
      'Referrer-Policy': 'no-referrer',
      'Cache-Control': 'no-cache',
    });
    if (req.method === 'HEAD') return res.end();
    createReadStream(file).pipe(res);
  };
}

/**
 * Builds if needed and starts serving. `port` 0 picks a free port.
 * Resolves to { server, port, url, close() }.
 */
export async function startServer({ port = 5173, host = '127.0.0.1', build = true, log } = {}) {
  if (build && appIsStale()) buildApp(log);
  const server = createServer(handler());
  await new Promise((ok, fail) => { server.once('error', fail); server.listen(port, host, ok); });
  const actual = server.address().port;
  return { server, port: actual, url: `http://localhost:${actual}/`, close: () => new Promise((ok) => server.close(() => ok())) };
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  const port = Number(process.env.PORT ?? 5173);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    process.stderr.write(`error: PORT must be a port number, got '${process.env.PORT}'\n`);
    process.exit(2);
  }
  try {
    const s = await startServer({ port });
    // Also answer on ::1, since browsers may resolve localhost to it; ignore machines without IPv6.
    const v6 = createServer(handler());
    v6.on('error', () => {});
    v6.listen(s.port, '::1');
    process.stdout.write(`Lacuna is ready at ${s.url}  (Ctrl+C stops it)\n`);
  } catch (e) {
    process.stderr.write(`error: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(e && e.code === 'EADDRINUSE' ? 2 : 1);
  }
}
