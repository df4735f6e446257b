import { describe, expect, it } from 'vitest';
import { parseCifDocument, parseCifNumber, findCifBlock } from '../../src/io';

// The syntax cases below follow the rules and examples of the CIF 1.1 syntax
// specification (IUCr, "CIF 1.1 syntax specification", paragraphs on quoted
// strings, text fields, comments, loops and reserved words).

function parse(text: string) {
  const r = parseCifDocument(text, 'test.cif');
  if (!r.ok) throw new Error('unexpected parse error: ' + r.error.describe());
  return r.value;
}
function parseError(text: string) {
  const r = parseCifDocument(text, 'test.cif');
  if (r.ok) throw new Error('expected a parse error');
  return r.error;
}

describe('CIF 1.1 syntax (IUCr specification cases)', () => {
  it('reads items, case-insensitive tags and block names', () => {
    const doc = parse('data_Test\n_Cell_Length_A 5.4(1)\n_cell_length_b   6\n');
    expect(doc.blocks).toHaveLength(1);
    const b = findCifBlock(doc, 'test')!;
    expect(b.name).toBe('Test');
    expect(b.findText('_CELL_LENGTH_A')).toBe('5.4(1)');
    expect(b.findNumber('_cell_length_a')).toEqual({ value: 5.4, su: 0.1 });
    expect(b.findNumber('_cell_length_b')).toEqual({ value: 6 });
    expect(b.find('_cell_length_c')).toBeUndefined();
  });

  it('keeps spaces inside quoted strings, and a quote not followed by blank does not end the string', () => {
    // specification example: 'a dog's life' is one value
    const doc = parse(`data_q\n_a 'a dog's life'\n_b "double quoted, with spaces"\n_c 'it''s'\n`);
    const b = doc.blocks[0];
    expect(b.findText('_a')).toBe("a dog's life");
    expect(b.findText('_b')).toBe('double quoted, with spaces');
    expect(b.findText('_c')).toBe("it''s");
    expect(b.find('_a')!.kind).toBe('quoted');
  });

  it('reads semicolon text fields across lines', () => {
    const doc = parse('data_t\n_publ_section_title\n;\n Line one\n  line two; with a semicolon\n;\n_next 1\n');
    const b = doc.blocks[0];
    expect(b.findText('_publ_section_title')).toBe(' Line one\n  line two; with a semicolon');
    expect(b.find('_publ_section_title')!.kind).toBe('text');
    expect(b.findNumber('_next')!.value).toBe(1);
    expect(b.find('_next')!.line).toBe(7);
  });

  it('ignores comments, but not a # inside quotes or a word', () => {
    const doc = parse('#\\#CIF_1.1\n# a comment\ndata_c # trailing comment\n_a 1 # one\n_b \'# not a comment\'\n_c x#y\n');
    const b = doc.blocks[0];
    expect(b.findText('_a')).toBe('1');
    expect(b.findText('_b')).toBe('# not a comment');
    expect(b.findText('_c')).toBe('x#y');
  });

  it('reads loops whose rows span lines and whose values are mixed', () => {
    const doc = parse([
      'data_l', 'loop_', '_atom_site_label', '_atom_site_fract_x', '_atom_site_note',
      'C1 0.1(2) ?', 'O2', '0.25', "'with spaces'", 'N3 .5', ';', 'a text field value', ';', '_after 7',
    ].join('\n'));
    const b = doc.blocks[0];
    const loop = b.findLoop('_ATOM_SITE_FRACT_X')!;
    expect(loop.rows).toHaveLength(3);
    expect(b.findColumn('_atom_site_label')!.map((v) => v.text)).toEqual(['C1', 'O2', 'N3']);
    expect(b.findColumn('_atom_site_note')!.map((v) => v.kind)).toEqual(['unknown', 'quoted', 'text']);
    expect(loop.rows[2][2].text).toBe('a text field value');
    expect(b.findText('_after')).toBe('7');
  });

  it('distinguishes ? and . from quoted "?" and "."', () => {
    const doc = parse(`data_s\n_a ?\n_b .\n_c '?'\n_d "."\n`);
    const b = doc.blocks[0];
    expect(b.find('_a')!.kind).toBe('unknown');
    expect(b.find('_b')!.kind).toBe('inapplicable');
    expect(b.findText('_a')).toBeUndefined();
    expect(b.findText('_c')).toBe('?');
    expect(b.findText('_d')).toBe('.');
  });

  it('reads several data blocks and save frames', () => {
    const doc = parse('data_one\n_x 1\ndata_TWO\n_x 2\nsave_frame1\n_y 3\nsave_\n_z 4\n');
    expect(doc.blocks.map((b) => b.name)).toEqual(['one', 'TWO']);
    expect(findCifBlock(doc, 'two')!.findText('_x')).toBe('2');
    expect(doc.blocks[1].frames[0].findText('_y')).toBe('3');
    expect(doc.blocks[1].findText('_z')).toBe('4');
  });

  it('accepts CRLF line ends and an empty document', () => {
    const doc = parse('data_w\r\n_a 1\r\n_b\r\n;\r\ntext\r\n;\r\n');
    expect(doc.blocks[0].findText('_b')).toBe('text');
    expect(parse('').blocks).toHaveLength(0);
    expect(parse('# only a comment\n').blocks).toHaveLength(0);
  });

  it('reports syntax errors with line and column', () => {
    let e = parseError('data_x\n_a 1\n_b\n');
    expect(e.message).toMatch(/'_b' has no value/);
    expect(e.location).toMatchObject({ file: 'test.cif', line: 3, column: 1 });
    e = parseError('data_x\nloop_\n_a\n_b\n1 2\n3\n');
    expect(e.message).toMatch(/3 values for 2 tags/);
    expect(e.location.line).toBe(6);
    e = parseError("data_x\n_a 'open\n");
    expect(e.message).toMatch(/unterminated quoted string/);
    expect(e.location).toMatchObject({ line: 2, column: 4 });
    e = parseError('data_x\n_a\n;\nnever closed\n');
    expect(e.message).toMatch(/unterminated text field/);
    expect(e.location.line).toBe(3);
    e = parseError('_a 1\n');
    expect(e.message).toMatch(/before any data_ block/);
    e = parseError('data_x\n_a 1\n_A 2\n');
    expect(e.message).toMatch(/occurs twice/);
    expect(e.location.line).toBe(3);
    e = parseError('data_x\n_a 1 2\n');
    expect(e.message).toMatch(/value '2' without a tag/);
    e = parseError('data_x\n_a global_\n');
    expect(e.message).toMatch(/reserved/);
    e = parseError('data_x\ndata_X\n');
    expect(e.message).toMatch(/used twice/);
  });
});

describe('parseCifNumber', () => {
  it('reads values with standard uncertainties (CIF 1.1 numeric values)', () => {
    expect(parseCifNumber('0.1234(5)')).toEqual({ value: 0.1234, su: 0.0005 });
    expect(parseCifNumber('12.5(12)')!.su).toBeCloseTo(1.2, 12);
    expect(parseCifNumber('-3')).toEqual({ value: -3 });
    expect(parseCifNumber('1.5e-3(2)')!.su).toBeCloseTo(2e-4, 15);
    expect(parseCifNumber('.5')).toEqual({ value: 0.5 });
    expect(parseCifNumber('120(3)')).toEqual({ value: 120, su: 3 });
    expect(parseCifNumber('?')).toBeUndefined();
    expect(parseCifNumber('.')).toBeUndefined();
    expect(parseCifNumber('abc')).toBeUndefined();
    expect(parseCifNumber('1.2.3')).toBeUndefined();
    expect(parseCifNumber('')).toBeUndefined();
  });
});
