import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { IN_CI, REPO_ROOT } from '../helpers/paths';

// The committed settings table and gemmi fixture must be exactly what their scripts write from
// gemmi (Debian python3-gemmi 0.5.7). Needs gemmi: fails in CI when missing, skips visibly elsewhere.
const PY = '/usr/bin/python3';
const hasGemmi = existsSync(PY) && spawnSync(PY, ['-c', 'import gemmi'], { encoding: 'utf8' }).status === 0;

describe('generated symmetry files are up to date with gemmi', () => {
  if (!hasGemmi && !IN_CI) {
    it.skip('SKIPPED: gemmi (Debian python3-gemmi) not found at /usr/bin/python3; install it to run this check', () => {});
    return;
  }
  for (const script of ['settings-table.py', 'symmetry-gemmi.py']) {
    it(`tests/reference/${script} --check`, () => {
      expect(hasGemmi, 'gemmi (python3-gemmi) is required under CI').toBe(true);
      const r = spawnSync(PY, [resolve(REPO_ROOT, 'tests/reference', script), '--check'], { encoding: 'utf8', cwd: REPO_ROOT });
      expect(r.stdout + r.stderr).toMatch(/up to date/);
      expect(r.status).toBe(0);
    });
  }
});
