#!/usr/bin/env python3
"""Names of the modules declared in the given files, for `kerf restructure --all-modules`.

Runs slang (through pyslang) over the files with the same include directories
and defines the reader gets — the driver set-up is kerf_read.open_sources — and
prints one line per module declared at file level, in the order of the files
and of the declarations (each name once). Nothing is elaborated here: each
module is then read on its own by kerf_read.py (`--top NAME`).

    python3 kerf_modules.py [-I DIR]... [-D NAME[=VALUE]]... FILE...

Exit codes follow kerf_read.py: 0 success; 1 slang reported errors (on
stderr, in slang's own format); 2 usage error; 3 pyslang missing.
"""

import sys

sys.dont_write_bytecode = True     # keep the source tree free of __pycache__
import kerf_read  # noqa: E402  (beside this file; also runs its Python version check)


def main(argv):
    import argparse
    p = argparse.ArgumentParser(prog="kerf_modules")
    p.add_argument("-I", dest="include_dirs", action="append", default=[])
    p.add_argument("-D", dest="defines", action="append", default=[])
    p.add_argument("files", nargs="+")
    try:
        args = p.parse_args(argv)
    except SystemExit:
        return kerf_read.EXIT_USAGE
    try:
        from pyslang import syntax
    except ImportError as exc:
        sys.stderr.write("kerf_modules: cannot import pyslang (%s)\n" % exc)
        return kerf_read.EXIT_NO_PYSLANG
    opened = kerf_read.open_sources("kerf_modules", args.include_dirs, args.defines, args.files)
    if isinstance(opened, int):
        return opened
    drv, parsed = opened
    ok = drv.reportParseDiags()
    if not parsed or not ok:
        return kerf_read.EXIT_ERRORS
    for name in kerf_read.declared_modules(drv, (syntax.SyntaxKind.ModuleDeclaration,)):
        sys.stdout.write(name + "\n")
    return kerf_read.EXIT_OK


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
