#!/usr/bin/env python3
"""Names of the modules declared in the given files, for `kerf restructure --all-modules`.

Runs slang (through pyslang) over the files with the same include directories
and defines the reader gets, and prints one line per module declared at file
level, in the order of the files and of the declarations (each name once). Nothing is elaborated here:
each module is then read on its own by src/reader/kerf_read.py (`--top NAME`).

    python3 kerf_modules.py [-I DIR]... [-D NAME[=VALUE]]... FILE...

Exit codes follow kerf_read.py: 0 success; 1 slang reported errors (on
stderr, in slang's own format); 2 usage error; 3 pyslang missing.
"""

import sys

EXIT_OK = 0
EXIT_ERRORS = 1
EXIT_USAGE = 2
EXIT_NO_PYSLANG = 3


def _quote(a):
    return "'" + a.replace("'", "'\\''") + "'" if any(c in a for c in " \t'\"\\") else a


def main(argv):
    import argparse
    p = argparse.ArgumentParser(prog="kerf_modules")
    p.add_argument("-I", dest="include_dirs", action="append", default=[])
    p.add_argument("-D", dest="defines", action="append", default=[])
    p.add_argument("files", nargs="+")
    try:
        args = p.parse_args(argv)
    except SystemExit:
        return EXIT_USAGE
    try:
        from pyslang import driver as sdriver
        from pyslang import syntax
    except ImportError as exc:
        sys.stderr.write("kerf_modules: cannot import pyslang (%s)\n" % exc)
        return EXIT_NO_PYSLANG
    cmd = ["kerf_modules"]
    for d in args.include_dirs:
        cmd += ["-I", d]
    for d in args.defines:
        cmd += ["-D", d]
    cmd += args.files
    drv = sdriver.Driver()
    drv.addStandardArgs()
    if not drv.parseCommandLine(" ".join(_quote(a) for a in cmd), sdriver.CommandLineOptions()):
        return EXIT_USAGE
    if not drv.processOptions():
        return EXIT_ERRORS
    parsed = drv.parseAllSources()
    ok = drv.reportParseDiags()
    if not parsed or not ok:
        return EXIT_ERRORS
    seen = set()
    for tree in drv.syntaxTrees:
        for m in getattr(tree.root, "members", None) or []:
            if m.kind != syntax.SyntaxKind.ModuleDeclaration:
                continue
            name = m.header.name.valueText
            if name in seen:
                continue
            seen.add(name)
            sys.stdout.write(name + "\n")
    return EXIT_OK


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
