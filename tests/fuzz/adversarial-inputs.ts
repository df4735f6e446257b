/**
 * About 10 MB adversarial inputs: each must be read or refused in time linear in
 * its size (the speed itself is measured in tests/bench/hardening.bench.ts; the
 * tests only check a proper result comes back). Built with Buffer fills, fast.
 */
export const ADVERSARIAL_NAMES = [
  'one-line-digits', 'one-line-header', 'one-line-cif-rows', 'huge-number', 'repeated-quotes', 'quote-pairs',
  'quoted-loop', 'empty-values-cif', 'dots-cif', 'empty-values-csv', 'unclosed-text-field', 'many-blocks',
  'many-loop-tags', 'comment-line', 'many-columns-text', 'nul-tail',
] as const;
export type AdversarialName = (typeof ADVERSARIAL_NAMES)[number];

export const ADVERSARIAL_BYTES = 10_000_000;

const LOOP_HEAD = 'data_adv\n_cell_length_a 10\n_cell_length_b 11\n_cell_length_c 12\n_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n' +
  'loop_\n_refln_index_h\n_refln_index_k\n_refln_index_l\n_refln_F_squared_meas\n_refln_F_squared_sigma\n';

/** `head` followed by `unit` repeated to fill about `size` bytes, then `tail`. */
function repeat(head: string, unit: string, tail = '', size = ADVERSARIAL_BYTES): Uint8Array {
  const h = Buffer.from(head, 'latin1'), u = Buffer.from(unit, 'latin1'), t = Buffer.from(tail, 'latin1');
  const count = Math.max(1, Math.floor((size - h.length - t.length) / u.length));
  const out = Buffer.allocUnsafe(h.length + count * u.length + t.length);
  h.copy(out, 0);
  out.fill(u, h.length, h.length + count * u.length);
  t.copy(out, h.length + count * u.length);
  return new Uint8Array(out.buffer, out.byteOffset, out.length);
}

export function makeAdversarial(name: AdversarialName): Uint8Array {
  switch (name) {
    case 'one-line-digits': return repeat('', '1');                                   // text, one line, no header
    case 'one-line-header': return repeat('', 'h k l I sigI ');                       // text header with a million names
    case 'one-line-cif-rows': return repeat(LOOP_HEAD, '1 2 3 45.5 1.5 ', '\n');      // valid rows all on one line
    case 'huge-number': return repeat(LOOP_HEAD + '1 2 3 ', '9', ' 1.5\n');           // one 10-million-digit value
    case 'repeated-quotes': return repeat('data_adv\n_exptl_crystal_description ', "'");
    case 'quote-pairs': return repeat('data_adv\n_exptl_crystal_description ', "'a");  // never closed by quote + blank
    case 'quoted-loop': return repeat(LOOP_HEAD, "'1' '2' '3' '45.5' \"1.5\"\n");
    case 'empty-values-cif': return repeat(LOOP_HEAD, '? ? ? ? ? ', '\n');            // 5 million missing values on one line
    case 'dots-cif': return repeat(LOOP_HEAD, '.\n.\n.\n.\n.\n');                       // one missing value per line
    case 'empty-values-csv': return repeat('h,k,l,I,sigI\n', ',,,,\n');
    case 'unclosed-text-field': return repeat('data_adv\n_exptl_special_details\n;\n', 'text line\n');
    case 'many-blocks': return repeat('', 'data_b\n');
    case 'many-loop-tags': return repeat('data_adv\nloop_\n_refln_index_h\n_refln_index_k\n_refln_index_l\n', '_refln_x\n', '1 2 3\n');
    case 'comment-line': return repeat(LOOP_HEAD + '1 2 3 45.5 1.5\n', '#', '\n2 2 3 45.5 1.5\n');
    case 'many-columns-text': return repeat('h k l I sigI', ' x', '\n1 2 3 4 5\n');
    case 'nul-tail': return repeat(LOOP_HEAD + '1 2 3 45.5 1.5\n'.repeat(200_000), '\u0000');  // zero-filled after a crash
  }
}
