import { readFileSync, readdirSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEFAULT_PROFILE, describeProfile, isObserved, parseProfile } from '../../src/profile';
import { runCli } from '../../src/cli';
import { REPO_ROOT } from '../helpers/paths';
import { captureCli } from '../helpers/capture-cli';

const capture = captureCli;

const PROFILES = resolve(REPO_ROOT, 'public/profiles');

describe('lab profiles', () => {
  it('every example profile in public/profiles validates', () => {
    const files = readdirSync(PROFILES).filter((f) => f.endsWith('.json') && f !== 'index.json');
    expect(files.length).toBeGreaterThanOrEqual(2);
    const index = JSON.parse(readFileSync(join(PROFILES, 'index.json'), 'utf8')) as { profiles: { file: string; name: string }[] };
    for (const f of files) {
      const r = parseProfile(readFileSync(join(PROFILES, f), 'utf8'), f);
      if (!r.ok) throw new Error(r.error.describe());
      expect(index.profiles.find((p) => p.file === f)?.name, f).toBe(r.value.name);
    }
  });

  it('fills defaults: Mo K-alpha 0.71073 A, I > 2 sigma, 3 degrees', () => {
    const r = parseProfile('{"lacuna_profile": 1, "name": "minimal"}', 'min.json');
    if (!r.ok) throw r.error;
    expect(r.value.wavelength).toEqual({ angstrom: 0.71073, label: 'Mo K-alpha' });
    expect(r.value.observedIOverSigma).toBe(2);
    expect(r.value.tolerances.latticeDeg).toBe(3);
    expect(r.value.monoclinicSetting).toBe('reduced');
    const cu = parseProfile('{"lacuna_profile": 1, "wavelength": "Cu K-alpha"}', 'cu.json');
    expect(cu.ok && cu.value.wavelength.angstrom).toBe(1.54184);
    expect(cu.ok && cu.value.name).toBe('cu.json');
  });

  it('names the JSON path (and the line) of every kind of mistake', () => {
    const cases: [string, RegExp][] = [
      ['{"name": "x"}', /\$\.lacuna_profile: missing/],
      ['{"lacuna_profile": 2}', /\$\.lacuna_profile: this version .* format 1, got 2/],
      ['[1,2]', /\$: expected a JSON object/],
      ['{"lacuna_profile": 1, "monoclinic_setting": "closest"}', /\$\.monoclinic_setting: expected one of "reduced", "beta-closest-to-90", got "closest"/],
      ['{"lacuna_profile": 1, "observed_i_over_sigma": "3"}', /\$\.observed_i_over_sigma: expected a number/],
      ['{"lacuna_profile": 1, "observed_i_over_sigma": -1}', /outside the accepted range/],
      ['{"lacuna_profile": 1, "wavelength": "Ag K-alpha"}', /\$\.wavelength: expected one of "Mo K-alpha", "Cu K-alpha"/],
      ['{"lacuna_profile": 1, "wavelength": 40}', /\$\.wavelength: 40 is outside/],
      ['{"lacuna_profile": 1, "tolerances": {"lattice_dg": 2}}', /\$\.tolerances\.lattice_dg: unknown key \(did you mean "lattice_deg"\?\)/],
      ['{"lacuna_profile": 1, "tolerances": {"lattice_deg": 0}}', /\$\.tolerances\.lattice_deg: 0 is outside/],
      ['{"lacuna_profile": 1, "text_export": {"columns": {"h": "h", "k": "h"}}}', /\$\.text_export\.columns: the name "h" is used for two columns/],
      ['{"lacuna_profile": 1, "text_export": {"columns": {"intensity": "I obs"}}}', /\$\.text_export\.columns\.intensity: "I obs" is not usable/],
      ['{"lacuna_profile": 1, "text_export": {"delimiter": ";"}}', /\$\.text_export\.delimiter: expected one of/],
      ['{"lacuna_profile": 1, "notes": ["ok", 3]}', /\$\.notes\[1\]: expected a string/],
      ['{"lacuna_profile": 1, "colour": "red"}', /\$\.colour: unknown key; known keys here: lacuna_profile, name/],
      ['{"lacuna_profile": 1,\n "name": "x",\n}', /not valid JSON/],
    ];
    for (const [text, re] of cases) {
      const r = parseProfile(text, 'p.json');
      expect(r.ok, text).toBe(false);
      if (!r.ok) expect(r.error.describe(), text).toMatch(re);
    }
    const multi = parseProfile('{\n  "lacuna_profile": 1,\n  "tolerances": {\n    "lattice_deg": "wide"\n  }\n}', 'p.json');
    expect(multi.ok).toBe(false);
    if (!multi.ok) expect(multi.error.describe()).toMatch(/^p\.json:4: \$\.tolerances\.lattice_deg: expected a number/);
    const bad = parseProfile('{"lacuna_profile": 1,\n "name": "x",\n}', 'p.json');
    if (!bad.ok) expect(bad.error.location.line).toBe(3);
  });

  it('counts a reflection as observed by the profile threshold, never with sigma <= 0', () => {
    expect(isObserved(DEFAULT_PROFILE, 2.1, 1)).toBe(true);
    expect(isObserved(DEFAULT_PROFILE, 2, 1)).toBe(false);
    expect(isObserved(DEFAULT_PROFILE, 5, 0)).toBe(false);
    expect(isObserved(DEFAULT_PROFILE, NaN, 1)).toBe(false);
  });

  it('describes its house rules in plain lines', () => {
    const lines = describeProfile(DEFAULT_PROFILE);
    expect(lines.join('\n')).toMatch(/observed reflection: I > 2 sigma\(I\)/);
    expect(lines.join('\n')).toMatch(/Mo K-alpha \(0\.71073 A\)/);
  });
});

describe('--profile on the command line', () => {
  const dir = mkdtempSync(join(tmpdir(), 'lacuna-profile-'));
  it('stops any command with exit 2 and the JSON path when the profile is invalid', async () => {
    writeFileSync(join(dir, 'bad.json'), '{\n  "lacuna_profile": 1,\n  "observed_i_over_sigma": "three"\n}\n');
    for (const argv of [['lattice', '--cell', '5,5,5,90,90,90'], ['groups', '--number', '14'], ['inspect', 'x.cif']]) {
      const c = capture(dir);
      expect(await runCli([...argv, '--profile', 'bad.json'], c.ctx), argv[0]).toBe(2);
      expect(c.err, argv[0]).toBe('error: bad.json:3: lab profile: $.observed_i_over_sigma: expected a number (multiples of sigma(I)), got "three"\n');
    }
  });
  it('reports a missing profile file', async () => {
    const c = capture(dir);
    expect(await runCli(['lattice', '--cell', '5,5,5,90,90,90', '--profile=nope.json'], c.ctx)).toBe(2);
    expect(c.err).toMatch(/^error: nope\.json: cannot read the lab profile: no such file/);
  });
  it('is listed in every command\'s help', async () => {
    const c = capture();
    expect(await runCli(['lattice', '--help'], c.ctx)).toBe(0);
    expect(c.out).toMatch(/--profile FILE/);
  });
});
