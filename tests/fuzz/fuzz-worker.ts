/**
 * Runs readers and commands on inputs sent by the fuzz tests, in a worker thread,
 * so that a hang shows up as a timeout the test can report (a synchronous endless
 * loop in the test's own thread could not be interrupted). Every answer is a list
 * of problems: an uncaught exception, an invariant broken (see invariants.ts).
 */
import { parentPort } from 'node:worker_threads';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readReflections, parseCifDocument } from '../../src/io';
import { parseModelCif } from '../../src/model';
import { runCli } from '../../src/cli';
import { checkErrorValue, checkRead } from './invariants';
import { makeAdversarial, type AdversarialName } from './adversarial-inputs';

export type FuzzRequest =
  | { kind: 'read'; bytes: Uint8Array; columns?: string[] }
  | { kind: 'prefixes'; bytes: Uint8Array }
  | { kind: 'cif'; bytes: Uint8Array }
  | { kind: 'cli'; argv: string[]; files: Record<string, Uint8Array> }
  | { kind: 'adversarial'; name: AdversarialName; command?: string };

export interface FuzzAnswer {
  problems: string[];
  /** Short description of what happened (for reports). */
  outcome: string;
}

const SOURCE = 'fuzz-input';

function readOne(bytes: Uint8Array, columns?: string[]): FuzzAnswer {
  const r = readReflections(bytes, { source: SOURCE, columns });
  const problems = checkRead(bytes, r, SOURCE, !columns, columns ? ['--columns'] : []);
  const outcome = r.ok ? `read ${r.value.n} rows, ${r.value.meta.rejectedCount} rejected` : `refused: ${r.error.describe()}`;
  return { problems, outcome };
}

function prefixes(bytes: Uint8Array): FuzzAnswer {
  const problems: string[] = [];
  let read = 0, refused = 0;
  for (let cut = 0; cut <= bytes.length; cut++) {
    const sub = bytes.subarray(0, cut);
    let p: string[];
    try {
      const r = readReflections(sub, { source: SOURCE });
      if (r.ok) read++; else refused++;
      p = checkRead(sub, r, SOURCE);
    } catch (e) {
      p = [`uncaught: ${e instanceof Error ? e.stack : String(e)}`];
    }
    if (p.length) problems.push(`cut at byte ${cut}: ${p.join('; ')}`);
    if (problems.length >= 5) break;
  }
  return { problems, outcome: `${read} prefixes read, ${refused} refused` };
}

function cif(bytes: Uint8Array): FuzzAnswer {
  const text = new TextDecoder('latin1').decode(bytes);
  const problems: string[] = [];
  const d = parseCifDocument(text, SOURCE);
  if (!d.ok) problems.push(...checkErrorValue(d.error, [SOURCE]));
  const m = parseModelCif(text, SOURCE);
  if (!m.ok) problems.push(...checkErrorValue(m.error, [SOURCE]));
  else {
    const md = m.value;
    if (!md.ops.length) problems.push('model without operations');
    if (![md.cell.a, md.cell.b, md.cell.c, md.cell.volume].every((x) => Number.isFinite(x) && x > 0)) problems.push('model with an impossible cell');
  }
  return { problems, outcome: `${d.ok ? 'document read' : 'document refused'}, ${m.ok ? `model with ${m.value.atoms.n} sites` : 'model refused: ' + m.error.describe()}` };
}

async function cli(argv: string[], files: Record<string, Uint8Array>): Promise<FuzzAnswer> {
  const dir = mkdtempSync(join(tmpdir(), 'lacuna-fuzz-'));
  try {
    for (const [name, bytes] of Object.entries(files)) writeFileSync(join(dir, name), bytes);
    let out = '', err = '';
    const code = await runCli(argv, { out: (t) => { out += t; }, err: (t) => { err += t; }, interactive: false, cwd: dir });
    const problems: string[] = [];
    // help and version text win over --json (what a user asking for help expects)
    const json = argv.includes('--json') && !argv.some((a) => a === '--help' || a === '-h') && !['help', '--version'].includes(argv[0]);
    if (code === 1) problems.push(`internal fault (exit 1): ${err.slice(0, 2000)}`);
    else if (code === 2) {
      if (!/^error: \S/.test(err)) problems.push(`exit 2 without an error: line: ${JSON.stringify(err.slice(0, 300))}`);
      if (/internal error/.test(err)) problems.push(`internal error text: ${err.slice(0, 300)}`);
      if (json && out !== '') problems.push('exit 2 but something on stdout');
      const input = Object.keys(files)[0];
      if (input && !argv.includes('--cell') && !err.includes(input) && !/^error: --/.test(err) && !/option|needs/.test(err))
        problems.push(`error does not name the file: ${err.trim()}`);
    } else if (code !== 0) problems.push(`exit code ${code}`);
    if (code === 0 && json) {
      try {
        const doc = JSON.parse(out);
        if (argv[0] === 'inspect' && doc.reflections + doc.rejected !== doc.rows_in_file)
          problems.push(`inspect: ${doc.reflections} + ${doc.rejected} != ${doc.rows_in_file}`);
      } catch (e) {
        problems.push(`--json output is not one JSON document: ${(e as Error).message}`);
      }
    }
    // inputs are never changed; no temporary file is left behind
    for (const [name, bytes] of Object.entries(files)) {
      const now = readFileSync(join(dir, name));
      if (Buffer.compare(now, Buffer.from(bytes)) !== 0) problems.push(`input ${name} was changed`);
    }
    const left = readdirSync(dir).filter((f) => f.endsWith('.tmp'));
    if (left.length) problems.push(`temporary files left: ${left.join(', ')}`);
    return { problems, outcome: `exit ${code}: ${(code === 0 ? out : err).split('\n')[0].slice(0, 200)}` };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function adversarial(name: AdversarialName, command?: string): Promise<FuzzAnswer> {
  const bytes = makeAdversarial(name);
  if (!command) return readOne(bytes);
  return cli([command, 'input.cif', '--json'], { 'input.cif': bytes });
}

parentPort!.on('message', async (msg: { id: number; req: FuzzRequest }) => {
  const { id, req } = msg;
  let answer: FuzzAnswer;
  try {
    switch (req.kind) {
      case 'read': answer = readOne(req.bytes, req.columns); break;
      case 'prefixes': answer = prefixes(req.bytes); break;
      case 'cif': answer = cif(req.bytes); break;
      case 'cli': answer = await cli(req.argv, req.files); break;
      case 'adversarial': answer = await adversarial(req.name, req.command); break;
    }
  } catch (e) {
    answer = { problems: [`uncaught exception: ${e instanceof Error ? e.stack : String(e)}`], outcome: 'threw' };
  }
  parentPort!.postMessage({ id, answer });
});
