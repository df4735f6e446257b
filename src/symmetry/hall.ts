import { fail, ok, type Result } from '../core';
import { DEN, makeOp, mod, composeOps, invertOp, parseTriplet, type SymOp } from './ops';

/**
 * Interpreter of Hall symbols (Hall 1981, Acta Cryst. A37, 517-525; International Tables
 * Vol. B, Section A1.4.2 and Tables A1.4.2.1-A1.4.2.6).
 *
 * A Hall symbol is `[-]L  [-]N^A_T ...  [(V)]`: an optional `-` for a centre of symmetry at the
 * origin, the lattice symbol L, one to four matrix symbols (rotation order N, optionally
 * improper, axis symbol A, translation symbols T including screw subscripts) and an optional
 * change-of-origin vector V in twelfths (or an operator such as `(x,y,z+1/12)`).
 * The result lists the generators: the lattice translations, the inversion when given, and one
 * operation per matrix symbol. `closeGroup` (group.ts) turns them into the whole group.
 */
export interface HallGenerators {
  readonly lattice: string;
  readonly centrosymmetric: boolean;
  /** Centring vectors, numerators over DEN, zero vector excluded. */
  readonly centring: readonly (readonly [number, number, number])[];
  /** Generators: inversion (if any) and the matrix symbols, after the change of origin. */
  readonly generators: readonly SymOp[];
}

const H = DEN / 2;
const T3 = DEN / 3;

/** Lattice symbols: Table A1.4.2.1. */
const LATTICE: Record<string, [number, number, number][]> = {
  P: [],
  A: [[0, H, H]],
  B: [[H, 0, H]],
  C: [[H, H, 0]],
  I: [[H, H, H]],
  R: [[2 * T3, T3, T3], [T3, 2 * T3, 2 * T3]],
  S: [[T3, T3, 2 * T3], [2 * T3, 2 * T3, T3]],
  T: [[T3, 2 * T3, T3], [2 * T3, T3, 2 * T3]],
  F: [[0, H, H], [H, 0, H], [H, H, 0]],
};

/** Translation symbols: Table A1.4.2.2 (in units of DEN). */
const Q = DEN / 4;
const TRANSLATION: Record<string, [number, number, number]> = {
  a: [H, 0, 0],
  b: [0, H, 0],
  c: [0, 0, H],
  n: [H, H, H],
  u: [Q, 0, 0],
  v: [0, Q, 0],
  w: [0, 0, Q],
  d: [Q, Q, Q],
};

/** Rotation matrices along the principal axes: Table A1.4.2.4 (row-major, x' = R x). */
const PRINCIPAL: Record<string, Record<number, number[]>> = {
  x: {
    1: [1, 0, 0, 0, 1, 0, 0, 0, 1],
    2: [1, 0, 0, 0, -1, 0, 0, 0, -1],
    3: [1, 0, 0, 0, 0, -1, 0, 1, -1],
    4: [1, 0, 0, 0, 0, -1, 0, 1, 0],
    6: [1, 0, 0, 0, 1, -1, 0, 1, 0],
  },
  y: {
    1: [1, 0, 0, 0, 1, 0, 0, 0, 1],
    2: [-1, 0, 0, 0, 1, 0, 0, 0, -1],
    3: [-1, 0, 1, 0, 1, 0, -1, 0, 0],
    4: [0, 0, 1, 0, 1, 0, -1, 0, 0],
    6: [0, 0, 1, 0, 1, 0, -1, 0, 1],
  },
  z: {
    1: [1, 0, 0, 0, 1, 0, 0, 0, 1],
    2: [-1, 0, 0, 0, -1, 0, 0, 0, 1],
    3: [0, -1, 0, 1, -1, 0, 0, 0, 1],
    4: [0, -1, 0, 1, 0, 0, 0, 0, 1],
    6: [1, -1, 0, 1, 0, 0, 0, 0, 1],
  },
};

/** Two-fold rotations along face diagonals: Table A1.4.2.5 (' and " relative to the reference axis). */
const DIAGONAL2: Record<string, Record<string, number[]>> = {
  x: { "'": [-1, 0, 0, 0, 0, -1, 0, -1, 0], '"': [-1, 0, 0, 0, 0, 1, 0, 1, 0] },
  y: { "'": [0, 0, -1, 0, -1, 0, -1, 0, 0], '"': [0, 0, 1, 0, -1, 0, 1, 0, 0] },
  z: { "'": [0, -1, 0, -1, 0, 0, 0, 0, -1], '"': [0, 1, 0, 1, 0, 0, 0, 0, -1] },
};

/** Three-fold rotation along the body diagonal a+b+c: Table A1.4.2.6. */
const BODY3 = [0, 0, 1, 1, 0, 0, 0, 1, 0];

const AXIS_VECTOR: Record<string, [number, number, number]> = { x: [1, 0, 0], y: [0, 1, 0], z: [0, 0, 1] };

interface MatrixSymbol {
  improper: boolean;
  order: number;
  axis?: string; // x y z ' " *
  screw?: number;
  letters: string;
  column: number;
}

/**
 * Read a Hall symbol into its generators. Errors name the offending part and its column
 * (1-based, within `symbol`).
 */
export function parseHall(symbol: string): Result<HallGenerators> {
  const where = (col: number) => ({ file: 'Hall symbol', column: col + 1 });
  let text = symbol;
  // change-of-origin part in parentheses at the end
  let shift: SymOp | undefined;
  const open = text.indexOf('(');
  if (open >= 0) {
    const close = text.indexOf(')', open);
    if (close < 0) return fail(`unclosed '(' in Hall symbol '${symbol}'`, where(open));
    if (text.slice(close + 1).trim() !== '') return fail(`unexpected text after ')' in Hall symbol '${symbol}'`, where(close + 1));
    const inner = text.slice(open + 1, close).trim();
    const s = parseOriginPart(inner);
    if (!s.ok) return fail(`bad change of origin '(${inner})' in Hall symbol '${symbol}': ${s.error.message}`, where(open));
    shift = s.value;
    text = text.slice(0, open);
  }
  // tokens with their columns
  const tokens: { text: string; column: number }[] = [];
  const re = /\S+/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text))) tokens.push({ text: m[0], column: m.index });
  if (tokens.length === 0) return fail('empty Hall symbol');
  let lat = tokens[0].text;
  let centrosymmetric = false;
  if (lat.startsWith('-')) {
    centrosymmetric = true;
    lat = lat.slice(1);
  }
  const latU = lat.toUpperCase();
  if (latU.length !== 1 || !(latU in LATTICE))
    return fail(`unknown lattice symbol '${lat}' in Hall symbol '${symbol}' (expected one of P A B C I R S T F, optionally preceded by -)`, where(tokens[0].column));
  if (tokens.length < 2) return fail(`Hall symbol '${symbol}' has no matrix symbol after the lattice symbol`, where(tokens[0].column));
  if (tokens.length > 5) return fail(`Hall symbol '${symbol}' has more than four matrix symbols`, where(tokens[5].column));

  const symbols: MatrixSymbol[] = [];
  for (let j = 1; j < tokens.length; j++) {
    const parsed = parseMatrixSymbol(tokens[j].text, tokens[j].column, symbol);
    if (!parsed.ok) return parsed;
    symbols.push(parsed.value);
  }

  const generators: SymOp[] = [];
  if (centrosymmetric) generators.push(makeOp([-1, 0, 0, 0, -1, 0, 0, 0, -1]));
  let prevOrder = 0;
  let prevAxis = 'z';
  for (let j = 0; j < symbols.length; j++) {
    const s = symbols[j];
    let axis = s.axis;
    // Default axes (Hall 1981; ITB A1.4.2.3): first rotation along c; a second two-fold along a
    // after a 2 or 4, along a-b (') after a 3 or 6; a third three-fold along a+b+c.
    if (axis === undefined) {
      if (s.order === 1) axis = 'z';
      else if (j === 0) axis = 'z';
      else if (j === 1 && s.order === 2) {
        if (prevOrder === 2 || prevOrder === 4) axis = 'x';
        else if (prevOrder === 3 || prevOrder === 6) axis = "'";
      } else if (j === 2 && s.order === 3) axis = '*';
      if (axis === undefined)
        return fail(`matrix symbol '${tokensText(s, symbol)}' in Hall symbol '${symbol}' needs an axis symbol (x, y, z, ', " or *)`, where(s.column));
    }
    let rot: number[];
    let principal: string | undefined;
    if (axis === 'x' || axis === 'y' || axis === 'z') {
      rot = PRINCIPAL[axis][s.order];
      principal = axis;
    } else if (axis === "'" || axis === '"') {
      if (s.order !== 2) return fail(`axis symbol ${axis} needs a two-fold rotation in Hall symbol '${symbol}'`, where(s.column));
      rot = DIAGONAL2[prevAxis][axis];
    } else {
      if (s.order !== 3) return fail(`axis symbol * needs a three-fold rotation in Hall symbol '${symbol}'`, where(s.column));
      rot = BODY3;
    }
    if (s.improper) rot = rot.map((v) => -v);
    const t = [0, 0, 0];
    for (const ch of s.letters) {
      const v = TRANSLATION[ch];
      for (let i = 0; i < 3; i++) t[i] += v[i];
    }
    if (s.screw !== undefined) {
      if (!principal) return fail(`a screw subscript needs a principal axis (x, y or z) in Hall symbol '${symbol}'`, where(s.column));
      if (s.screw >= s.order) return fail(`screw subscript ${s.screw} is not smaller than the rotation order ${s.order} in Hall symbol '${symbol}'`, where(s.column));
      const v = AXIS_VECTOR[principal];
      for (let i = 0; i < 3; i++) t[i] += (v[i] * s.screw * DEN) / s.order;
    }
    generators.push(makeOp(rot, t));
    prevOrder = s.order;
    // the reference axis for ' and " is the axis of the preceding principal rotation
    if (principal) prevAxis = principal;
  }

  let centring = LATTICE[latU].map((v) => [...v] as [number, number, number]);
  let gens = generators;
  if (shift) {
    // Change of origin: every Seitz matrix S becomes V S V^-1 (Hall 1981, section 4).
    const inv = invertOp(shift);
    gens = gens.map((g) => composeOps(shift!, composeOps(g, inv)));
    centring = centring.map((c) => {
      const o = composeOps(shift!, composeOps(makeOp([1, 0, 0, 0, 1, 0, 0, 0, 1], c), inv));
      return [o.t[0], o.t[1], o.t[2]];
    });
  }
  return ok({ lattice: latU, centrosymmetric, centring, generators: gens });
}

function tokensText(s: MatrixSymbol, symbol: string): string {
  const rest = symbol.slice(s.column);
  return rest.split(/\s/)[0];
}

function parseMatrixSymbol(tok: string, column: number, symbol: string): Result<MatrixSymbol> {
  const where = { file: 'Hall symbol', column: column + 1 };
  let j = 0;
  let improper = false;
  if (tok[j] === '-') {
    improper = true;
    j++;
  }
  const order = Number(tok[j]);
  if (![1, 2, 3, 4, 6].includes(order))
    return fail(`'${tok}' in Hall symbol '${symbol}' does not start with a rotation order 1, 2, 3, 4 or 6`, where);
  j++;
  let axis: string | undefined;
  let screw: number | undefined;
  let letters = '';
  for (; j < tok.length; j++) {
    const ch = tok[j];
    const lower = ch.toLowerCase();
    if ('xyz\'"*'.includes(lower)) {
      if (axis !== undefined) return fail(`two axis symbols in '${tok}' of Hall symbol '${symbol}'`, where);
      axis = lower;
    } else if (/[1-5]/.test(ch)) {
      if (screw !== undefined) return fail(`two screw subscripts in '${tok}' of Hall symbol '${symbol}'`, where);
      screw = Number(ch);
    } else if (lower in TRANSLATION) {
      letters += lower;
    } else {
      return fail(`unknown symbol '${ch}' in '${tok}' of Hall symbol '${symbol}' (axes x y z ' " *, translations a b c n u v w d, screw digits 1-5)`, where);
    }
  }
  return ok({ improper, order, axis, screw, letters, column });
}

/** `(0 0 1)` in twelfths, or an operation such as `(x,y,z+1/12)` / `(-x+z,y,-x)`. */
function parseOriginPart(inner: string): Result<SymOp> {
  if (/[xyzXYZ]/.test(inner)) return parseTriplet(inner);
  const parts = inner.split(/[\s,]+/).filter((s) => s !== '');
  if (parts.length !== 3 || !parts.every((p) => /^[+-]?\d+$/.test(p)))
    return fail('expected three integers (twelfths), e.g. (0 0 1)');
  const v = parts.map((p) => mod(Number(p) * (DEN / 12), DEN));
  return ok(makeOp([1, 0, 0, 0, 1, 0, 0, 0, 1], v));
}
