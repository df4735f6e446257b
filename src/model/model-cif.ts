import { fail, ok, InputError, type Result } from '../core';
import { parseCifDocument, cifValueNumber, isMissingValue, type CifBlock, type CifValue } from '../io';
import { makeCell } from '../lattice';
import { closeGroup, findSetting, parseTriplet, type SymOp } from '../symmetry';
import { atomSitesFromList, type AtomInput, type CrystalModel } from './crystal-model';
import { findFormFactor, findIonFormFactor, parseTypeSymbol } from './form-factors';
import { closestDistinctImage, siteSymmetryOrder } from './site-symmetry';

/**
 * Reader for trial structures in CIF 1.1 (IUCr core dictionary):
 *   _cell_length_a/b/c, _cell_angle_alpha/beta/gamma;
 *   symmetry from _space_group_symop_operation_xyz or _symmetry_equiv_pos_as_xyz, else from
 *   _space_group_name_Hall / _symmetry_space_group_name_Hall, else from the H-M name;
 *   _atom_site_label, _atom_site_type_symbol (charges such as O2- accepted), _atom_site_fract_x/y/z,
 *   _atom_site_occupancy, _atom_site_U_iso_or_equiv or _atom_site_B_iso_or_equiv, and the
 *   _atom_site_aniso_U_11 ... _23 (or _B_) loop. Values may carry s.u. in parentheses.
 * Errors are values with file, line and column.
 */
export interface ModelReadOptions {
  /** Data block to read; default: the first block with atom sites. */
  block?: string;
}

const EIGHT_PI2 = 8 * Math.PI * Math.PI;

const CELL_TAGS = [
  ['a', '_cell_length_a'], ['b', '_cell_length_b'], ['c', '_cell_length_c'],
  ['alpha', '_cell_angle_alpha'], ['beta', '_cell_angle_beta'], ['gamma', '_cell_angle_gamma'],
] as const;

/** Parse the text of a model CIF. `source` names the file in messages. */
export function parseModelCif(text: string, source: string, options: ModelReadOptions = {}): Result<CrystalModel> {
  const doc = parseCifDocument(text, source);
  if (!doc.ok) return doc;
  const blocks = doc.value.blocks;
  let block: CifBlock | undefined;
  if (options.block !== undefined) {
    block = blocks.find((b) => b.name.toLowerCase() === options.block!.toLowerCase());
    if (!block) return fail(`no data block '${options.block}' (blocks: ${blocks.map((b) => b.name).join(', ') || 'none'})`, { file: source });
  } else {
    block = blocks.find((b) => b.has('_atom_site_fract_x'));
    if (!block)
      return fail('no atom sites: a model needs a loop with _atom_site_label and _atom_site_fract_x/y/z', { file: source },
        blocks.some((b) => b.has('_refln_index_h')) ? 'This looks like a reflection file; give the model CIF first, then the data.' : undefined);
  }
  try {
    return ok(readBlock(block, source));
  } catch (e) {
    if (e instanceof InputError) return { ok: false, error: e };
    throw e;
  }
}

function at(source: string, v: CifValue | undefined, fallbackLine: number) {
  return { file: source, line: v?.line ?? fallbackLine, column: v?.column };
}

function readBlock(block: CifBlock, source: string): CrystalModel {
  const warnings: string[] = [];
  const num = (v: CifValue | undefined, what: string): number | undefined => {
    if (v === undefined || isMissingValue(v)) return undefined;
    const n = cifValueNumber(v);
    if (n === undefined || !Number.isFinite(n.value)) throw new InputError(`${what}: '${v.text}' is not a number`, at(source, v, block.line));
    return n.value;
  };

  // cell
  const cellParams: Record<string, number> = {};
  for (const [key, tag] of CELL_TAGS) {
    const v = block.find(tag);
    const x = num(v, tag);
    if (x === undefined) throw new InputError(`${tag} is missing or unknown in data block '${block.name}'`, at(source, v, block.line));
    cellParams[key] = x;
  }
  const cellResult = makeCell(cellParams as never, { file: source, line: block.find('_cell_length_a')?.line });
  if (!cellResult.ok) throw cellResult.error;

  const { ops, name } = readSymmetry(block, source, warnings);

  // atom sites
  const labels = block.findColumn('_atom_site_label');
  const fx = block.findColumn('_atom_site_fract_x');
  const fy = block.findColumn('_atom_site_fract_y');
  const fz = block.findColumn('_atom_site_fract_z');
  if (!fx || !fy || !fz)
    throw new InputError('atom sites need _atom_site_fract_x, _atom_site_fract_y and _atom_site_fract_z', { file: source, line: block.line },
      'Cartesian-only models are not read; give fractional coordinates.');
  const types = block.findColumn('_atom_site_type_symbol');
  const occ = block.findColumn('_atom_site_occupancy');
  const uiso = block.findColumn('_atom_site_U_iso_or_equiv') ?? block.findColumn('_atom_site_U_iso');
  const biso = block.findColumn('_atom_site_B_iso_or_equiv') ?? block.findColumn('_atom_site_B_iso');
  const calcFlag = block.findColumn('_atom_site_calc_flag');
  const atoms: AtomInput[] = [];
  const byLabel = new Map<string, number>();
  const ionWarned = new Set<string>();
  for (let j = 0; j < fx.length; j++) {
    const labelV = labels?.[j];
    const label = labelV && !isMissingValue(labelV) ? labelV.text : `atom${j + 1}`;
    if (calcFlag && calcFlag[j].text.toLowerCase() === 'dum') {
      warnings.push(`${label}: dummy site (_atom_site_calc_flag dum) left out`);
      continue;
    }
    const typeV = types?.[j];
    let element: string;
    let charge = 0;
    if (typeV && !isMissingValue(typeV)) {
      const ts = parseTypeSymbol(typeV.text);
      if (!ts)
        throw new InputError(`unknown element '${typeV.text}' for atom ${label}`, at(source, typeV, fx[j].line),
          'Type symbols are an element symbol H..Cf, optionally with a charge such as O2- or Fe3+.');
      element = ts.element;
      charge = ts.charge;
    } else {
      const m = /^([A-Za-z]{1,2})/.exec(label);
      const two = m && findFormFactor(m[1]);
      const one = m && findFormFactor(m[1][0]);
      const found = two ?? one;
      if (!found)
        throw new InputError(`no _atom_site_type_symbol for atom ${label}, and its label does not start with an element symbol`, at(source, labelV, fx[j].line));
      element = found.element;
      warnings.push(`${label}: element ${element} taken from the label (no _atom_site_type_symbol)`);
    }
    if (charge !== 0 && !findIonFormFactor(element, charge) && !ionWarned.has(typeV!.text)) {
      ionWarned.add(typeV!.text);
      warnings.push(`${typeV!.text}: no form factor for this ion in Lacuna's tables (ions: Waasmaier & Kirfel 1995); the neutral ${element} form factor (International Tables Vol. C Table 6.1.1.4) is used`);
    }
    const x = num(fx[j], `_atom_site_fract_x of ${label}`);
    const y = num(fy[j], `_atom_site_fract_y of ${label}`);
    const z = num(fz[j], `_atom_site_fract_z of ${label}`);
    if (x === undefined || y === undefined || z === undefined)
      throw new InputError(`atom ${label} has an unknown fractional coordinate`, at(source, labelV ?? fx[j], fx[j].line));
    const o = occ ? num(occ[j], `_atom_site_occupancy of ${label}`) ?? 1 : 1;
    if (o < 0 || o > 1.0001) throw new InputError(`occupancy ${o} of atom ${label} lies outside 0..1`, at(source, occ![j], fx[j].line));
    let u = uiso ? num(uiso[j], `_atom_site_U_iso_or_equiv of ${label}`) : undefined;
    if (u === undefined && biso) {
      const b = num(biso[j], `_atom_site_B_iso_or_equiv of ${label}`);
      if (b !== undefined) u = b / EIGHT_PI2;
    }
    if (u !== undefined && u < 0) warnings.push(`${label}: negative U_iso ${u} (non-positive-definite displacement) used as given`);
    if (byLabel.has(label)) throw new InputError(`atom label ${label} occurs twice`, at(source, labelV, fx[j].line));
    byLabel.set(label, atoms.length);
    atoms.push({ label, element, charge, x, y, z, occupancy: o, uiso: u ?? Number.NaN });
  }
  readAniso(block, source, atoms, byLabel, num);
  const noU: string[] = [];
  for (const a of atoms) {
    if (!Number.isNaN(a.uiso!)) continue;
    if (a.aniso) a.uiso = (a.aniso[0] + a.aniso[1] + a.aniso[2]) / 3;
    else { a.uiso = 0; noU.push(a.label); }
  }
  if (noU.length) warnings.push(`no displacement parameter for ${noU.slice(0, 8).join(', ')}${noU.length > 8 ? ` and ${noU.length - 8} more` : ''}: U = 0 used`);
  if (atoms.length === 0) throw new InputError('the model has no atoms', { file: source, line: block.line });
  const model = { source, cell: cellResult.value, ops, spaceGroupName: name, atoms: atomSitesFromList(atoms), warnings };
  warnNearSpecialPositions(model);
  checkMultiplicities(model, block.findColumn('_atom_site_symmetry_multiplicity'), labels, warnings);
  return model;
}

/** The file's _atom_site_symmetry_multiplicity against the one the operations give (order of the group / site-symmetry order). */
function checkMultiplicities(model: CrystalModel, given: CifValue[] | undefined, labels: CifValue[] | undefined, warnings: string[]): void {
  if (!given || !labels) return;
  const row = new Map(labels.map((v, j) => [v.text, j]));
  for (let j = 0; j < model.atoms.n; j++) {
    const r = row.get(model.atoms.label[j]);
    const v = r === undefined ? undefined : cifValueNumber(given[r]);
    if (!v) continue;
    const ours = model.ops.length / siteSymmetryOrder(model, model.atoms.x[j], model.atoms.y[j], model.atoms.z[j]);
    if (v.value !== ours)
      warnings.push(`${model.atoms.label[j]}: the file gives site multiplicity ${v.value}, the operations give ${ours}; ${ours} is used`);
  }
}

/** Closer than this (angstrom) to its own symmetry image, an atom off a special position is almost surely a mistake. */
const NEAR_IMAGE = 0.5;

/**
 * An atom a little off a special position overlaps its own images (the structure factor then counts it
 * several times). Real files have it from rounded coordinates or disorder; say so instead of guessing.
 */
function warnNearSpecialPositions(model: CrystalModel): void {
  const { atoms } = model;
  for (let j = 0; j < atoms.n; j++) {
    const closest = closestDistinctImage(model, atoms.x[j], atoms.y[j], atoms.z[j]);
    if (closest < NEAR_IMAGE)
      model.warnings.push(`${atoms.label[j]} lies ${closest.toFixed(2)} A from its own symmetry image: close to, but not on, a special position (counted as a general position)`);
  }
}

function readAniso(
  block: CifBlock, source: string, atoms: AtomInput[], byLabel: Map<string, number>,
  num: (v: CifValue | undefined, what: string) => number | undefined,
): void {
  const labels = block.findColumn('_atom_site_aniso_label');
  if (!labels) return;
  const useB = !block.has('_atom_site_aniso_U_11') && block.has('_atom_site_aniso_B_11');
  const letter = useB ? 'B' : 'U';
  const cols = ['11', '22', '33', '12', '13', '23'].map((ij) => {
    const tag = `_atom_site_aniso_${letter}_${ij}`;
    const c = block.findColumn(tag);
    if (!c) throw new InputError(`the anisotropic loop has no ${tag}`, { file: source, line: labels[0]?.line ?? block.line });
    return [tag, c] as const;
  });
  for (let j = 0; j < labels.length; j++) {
    const lv = labels[j];
    const idx = byLabel.get(lv.text);
    if (idx === undefined) throw new InputError(`anisotropic displacement for ${lv.text}, which is not among the atom sites`, at(source, lv, block.line));
    const u = cols.map(([tag, c]) => {
      const x = num(c[j], `${tag} of ${lv.text}`);
      if (x === undefined) throw new InputError(`${tag} of ${lv.text} is unknown`, at(source, c[j], lv.line));
      return useB ? x / EIGHT_PI2 : x;
    });
    atoms[idx].aniso = u;
  }
}

const SYMOP_TAGS = ['_space_group_symop_operation_xyz', '_symmetry_equiv_pos_as_xyz'];
const HALL_TAGS = ['_space_group_name_Hall', '_symmetry_space_group_name_Hall'];
const HM_TAGS = ['_space_group_name_H-M_alt', '_symmetry_space_group_name_H-M', '_space_group_name_H-M'];

function readSymmetry(block: CifBlock, source: string, warnings: string[]): { ops: SymOp[]; name?: string } {
  for (const tag of SYMOP_TAGS) {
    const col = block.findColumn(tag);
    if (!col) continue;
    const ops: SymOp[] = [];
    for (const v of col) {
      const r = parseTriplet(v.text);
      if (!r.ok) {
        const col0 = r.error.location.column;
        throw new InputError(r.error.message, { file: source, line: v.line, column: col0 !== undefined ? v.column + col0 - 1 : v.column });
      }
      ops.push(r.value);
    }
    const closed = closeGroup(ops);
    if (!closed)
      throw new InputError(`the ${ops.length} operations of ${tag} generate more than 192 operations: not a space group`, { file: source, line: col[0].line });
    if (closed.length > ops.length)
      warnings.push(`the ${ops.length} operations of ${tag} do not form a group; completed to ${closed.length} operations`);
    else if (closed.length < ops.length) warnings.push(`${tag} lists ${ops.length - closed.length} operation(s) twice; duplicates ignored`);
    return { ops: closed, name: block.findText(HM_TAGS[0]) ?? block.findText(HM_TAGS[1]) ?? block.findText(HALL_TAGS[0]) };
  }
  for (const tag of [...HALL_TAGS, ...HM_TAGS]) {
    const v = block.find(tag);
    if (!v || isMissingValue(v)) continue;
    const setting = findSetting(v.text);
    if (!setting)
      throw new InputError(`unknown space-group symbol '${v.text}' in ${tag}`, at(source, v, block.line),
        "List the operations in a _space_group_symop_operation_xyz loop, or use a symbol that 'lacuna groups' knows.");
    return { ops: [...setting.ops], name: v.text };
  }
  throw new InputError(`data block '${block.name}' gives no symmetry`, { file: source, line: block.line },
    'Give _space_group_symop_operation_xyz (or _symmetry_equiv_pos_as_xyz) or a space-group name.');
}
