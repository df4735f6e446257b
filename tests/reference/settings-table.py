#!/usr/bin/python3
"""Generate src/symmetry/settings-data.ts: the space-group settings table.

Source: the settings of International Tables for Crystallography Vol. A, Table 4.3.2.1
(ITA number and extended Hermann-Mauguin symbol) with their Hall symbols
(Hall 1981, Acta Cryst. A37, 517-525; International Tables Vol. B, Table A1.4.2.7),
as tabulated by the gemmi library (Debian python3-gemmi), gemmi.spacegroup_table().

Only the symbol strings are written; src/symmetry builds every group from its Hall
symbol with its own interpreter.

Run: /usr/bin/python3 tests/reference/settings-table.py [--check]
(--check: write nothing, exit 1 if the committed file differs from what gemmi gives now)
"""
import json, os, sys
import gemmi

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, '..', '..', 'src', 'symmetry', 'settings-data.ts')


def main():
    rows = []
    for sg in gemmi.spacegroup_table():
        ext = sg.ext if sg.ext not in ('\x00', '') else ''
        rows.append([sg.number, sg.xhm(), sg.hall, ext, sg.qualifier])
    lines = [
        '// GENERATED FILE, DO NOT EDIT. Regenerate with: /usr/bin/python3 tests/reference/settings-table.py',
        '//',
        '// Space-group settings of International Tables for Crystallography Vol. A, Table 4.3.2.1',
        '// (number, extended Hermann-Mauguin symbol with :1/:2 origin choice or :H/:R axes) and their',
        '// Hall symbols (Hall 1981, Acta Cryst. A37, 517-525; International Tables Vol. B, Table A1.4.2.7),',
        '// as tabulated by gemmi %s, gemmi.spacegroup_table() (%d entries). gemmi also lists a few settings' % (gemmi.__version__, len(rows)),
        '// beyond Table 4.3.2.1 (for example C- and F-centred tetragonal cells such as C -4 2 m, F 4/m m m);',
        '// they are kept as gemmi lists them.',
        '// Columns: ITA number, H-M symbol, Hall symbol, extension (origin choice / axes), qualifier',
        '// (unique axis and cell choice, or axis permutation).',
        '',
        'export const SETTINGS_DATA: readonly (readonly [number, string, string, string, string])[] = [',
    ]
    for r in rows:
        lines.append('  ' + json.dumps(r) + ',')
    lines.append('];')
    text = '\n'.join(lines) + '\n'
    if '--check' in sys.argv:
        with open(OUT) as f:
            same = f.read() == text
        print('%s: %s' % (os.path.relpath(OUT), 'up to date' if same else 'DIFFERS from gemmi %s output' % gemmi.__version__))
        sys.exit(0 if same else 1)
    with open(OUT, 'w') as f:
        f.write(text)
    print('wrote %s (%d settings)' % (os.path.relpath(OUT), len(rows)))


if __name__ == '__main__':
    main()
