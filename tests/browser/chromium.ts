import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';
import { IN_CI } from '../helpers/paths';

/** Debian's Chromium; playwright-core never downloads a browser. */
export const CHROMIUM = '/usr/bin/chromium';

export const CHROMIUM_FLAGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update',
  '--disable-sync', '--no-first-run',
  // Lets WebGL run on the software rasteriser in a GPU-less headless browser, so both renderers can be tested.
  '--enable-unsafe-swiftshader',
];

/**
 * Whether browser tests can run. Under CI a missing Chromium is a failure
 * (the caller turns `reason` into a failing test); elsewhere a reported skip.
 */
export function chromiumStatus(): { available: boolean; reason?: string } {
  if (existsSync(CHROMIUM)) return { available: true };
  return { available: false, reason: `Chromium not found at ${CHROMIUM} (Debian package 'chromium')${IN_CI ? ': required in CI' : ': browser tests skipped'}` };
}

/** A fresh browser profile in a temporary folder, removed by close(). */
export async function launchChromium(viewport = { width: 1366, height: 768 }): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir(), 'lacuna-chromium-'));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM, headless: true, args: CHROMIUM_FLAGS, viewport, deviceScaleFactor: 1,
  });
  // A loaded 2-core CI machine runs other tests beside these: give waits room.
  context.setDefaultTimeout(60_000);
  return { context, close: async () => { await context.close(); rmSync(dir, { recursive: true, force: true }); } };
}
