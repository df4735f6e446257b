import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { allSettings, composeOps, DEN, formatTriplet, identityOp, invertOp, makeOp, opKey, parseTriplet, isSystematicallyAbsent } from '../../src/symmetry';
import { gemmiFixture } from './reference-fixture';

// Property-based checks (fast-check) over every setting: the operation set is a group.
// Orders are compared with gemmi's (fixture tests/reference/symmetry-gemmi.json).
const settings = allSettings();
const fx = gemmiFixture();

describe('every setting is a group (property-based)', () => {
  const settingArb = fc.integer({ min: 0, max: settings.length - 1 });

  it('closure: the product of two operations is an operation', () => {
    fc.assert(
      fc.property(settingArb, fc.nat(), fc.nat(), (si, a, b) => {
        const s = settings[si];
        const keys = new Set(s.ops.map(opKey));
        return keys.has(opKey(composeOps(s.ops[a % s.order], s.ops[b % s.order])));
      }),
      { numRuns: 3000 },
    );
  });

  it('inverses: every operation has its inverse in the group, and g g^-1 = identity', () => {
    fc.assert(
      fc.property(settingArb, fc.nat(), (si, a) => {
        const s = settings[si];
        const g = s.ops[a % s.order];
        const inv = invertOp(g);
        const keys = new Set(s.ops.map(opKey));
        return keys.has(opKey(inv)) && opKey(composeOps(g, inv)) === opKey(identityOp());
      }),
      { numRuns: 3000 },
    );
  });

  it('associativity holds for random triples', () => {
    fc.assert(
      fc.property(settingArb, fc.nat(), fc.nat(), fc.nat(), (si, a, b, c) => {
        const s = settings[si];
        const [x, y, z] = [a, b, c].map((j) => s.ops[j % s.order]);
        return opKey(composeOps(composeOps(x, y), z)) === opKey(composeOps(x, composeOps(y, z)));
      }),
      { numRuns: 2000 },
    );
  });

  it('exhaustively for every setting: closed, distinct, identity first, order equal to gemmi', () => {
    const bad: string[] = [];
    settings.forEach((s, i) => {
      const keys = new Set(s.ops.map(opKey));
      if (keys.size !== s.order) bad.push(`${s.hm}: duplicate operations`);
      if (opKey(s.ops[0]) !== opKey(identityOp())) bad.push(`${s.hm}: identity not first`);
      if (s.order !== fx.settings[i].order) bad.push(`${s.hm}: order ${s.order} vs gemmi ${fx.settings[i].order}`);
      for (const a of s.ops) for (const b of s.ops) if (!keys.has(opKey(composeOps(a, b)))) { bad.push(`${s.hm}: not closed`); return; }
    });
    expect(bad).toEqual([]);
  });

  it('absences are invariant under the Laue group and Friedel pairs (random reflections)', () => {
    fc.assert(
      fc.property(settingArb, fc.integer({ min: -12, max: 12 }), fc.integer({ min: -12, max: 12 }), fc.integer({ min: -12, max: 12 }), (si, h, k, l) => {
        const s = settings[si];
        const a = isSystematicallyAbsent(s, h, k, l);
        return s.laueRotations.every((r) => isSystematicallyAbsent(s, h * r[0] + k * r[3] + l * r[6], h * r[1] + k * r[4] + l * r[7], h * r[2] + k * r[5] + l * r[8]) === a);
      }),
      { numRuns: 3000 },
    );
  });
});

describe('operation text round trip (property-based)', () => {
  it('parseTriplet(formatTriplet(op)) is op for operations of any setting with any translation', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: settings.length - 1 }), fc.nat(), fc.tuple(fc.integer({ min: -48, max: 48 }), fc.integer({ min: -48, max: 48 }), fc.integer({ min: -48, max: 48 })), (si, a, t) => {
        const s = settings[si];
        const o = makeOp(s.ops[a % s.order].r, t);
        const back = parseTriplet(formatTriplet(o));
        return back.ok && opKey(back.value) === opKey(o) && o.t.every((x) => x >= 0 && x < DEN);
      }),
      { numRuns: 3000 },
    );
  });
});
