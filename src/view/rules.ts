/**
 * Reflection conditions as the ranking reports them ({text, zone, coeffs,
 * modulus}, the project's contract): a reflection is forbidden by a rule when
 * it lies in the rule's zone (e . h = 0 for every zone row e) and coeffs . h
 * is not a multiple of modulus.
 */
export interface Rule {
  readonly text: string;
  readonly zone: readonly (readonly number[])[];
  readonly coeffs: readonly number[];
  readonly modulus: number;
}

export function inZone(rule: Rule, h: number, k: number, l: number): boolean {
  for (const e of rule.zone) if (e[0] * h + e[1] * k + e[2] * l !== 0) return false;
  return true;
}

export function ruleForbids(rule: Rule, h: number, k: number, l: number): boolean {
  if (!inZone(rule, h, k, l)) return false;
  const s = rule.coeffs[0] * h + rule.coeffs[1] * k + rule.coeffs[2] * l;
  return s % rule.modulus !== 0;
}

export function anyRuleForbids(rules: readonly Rule[], h: number, k: number, l: number): boolean {
  for (const r of rules) if (ruleForbids(r, h, k, l)) return true;
  return false;
}

/**
 * The layer that best shows a rule's zone: one zone row e gives the layer
 * e . h = 0 (e.g. [0,1,0] -> h0l); an axis (two rows) gives the first of
 * h0l, 0kl, hk0 that contains it; no zone (centring) gives undefined.
 */
export function layerForRule(rule: Rule): string | undefined {
  const named: Record<string, string> = { '0,0,1': 'hk0', '0,1,0': 'h0l', '1,0,0': '0kl', '1,-1,0': 'hhl', '-1,1,0': 'hhl' };
  if (rule.zone.length === 1) {
    const e = rule.zone[0];
    const key = e.join(',');
    return named[key] ?? `${e[0]},${e[1]},${e[2]},0`;
  }
  if (rule.zone.length >= 2) {
    for (const [name, e] of [['h0l', [0, 1, 0]], ['0kl', [1, 0, 0]], ['hk0', [0, 0, 1]]] as const) {
      // The axis lies in the layer when every vector of the zone's solution space satisfies e . h = 0.
      const a = rule.zone[0], b = rule.zone[1];
      const axis = [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
      if (e[0] * axis[0] + e[1] * axis[1] + e[2] * axis[2] === 0) return name;
    }
  }
  return undefined;
}
