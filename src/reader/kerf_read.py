#!/usr/bin/env python3
"""kerf's Verilog/SystemVerilog reader.

Runs slang (through pyslang) on the user's files, elaborates one module and
prints its description as one compact JSON object on stdout, in the format
documented in docs/reader-format.md (`kerf-module`, version 1).

    python3 kerf_read.py [--top NAME] [-I DIR]... [-D NAME[=VALUE]]... FILE...

Exit codes: 0 success; 1 slang reported errors (on stderr, in slang's own
format); 2 usage error, module not found or ambiguous; 3 pyslang missing;
4 internal error of the reader (a traceback on stderr).
"""

import argparse
import json
import os
import sys

EXIT_OK = 0
EXIT_ERRORS = 1
EXIT_USAGE = 2
EXIT_NO_PYSLANG = 3
EXIT_INTERNAL = 4


class _Parser(argparse.ArgumentParser):
    def error(self, message):
        self.print_usage(sys.stderr)
        sys.stderr.write("kerf_read: %s\n" % message)
        sys.exit(EXIT_USAGE)


def parse_args(argv):
    p = _Parser(prog="kerf_read",
                description="Describe one elaborated module as JSON for kerf.")
    p.add_argument("--top", help="module to describe (default: the only top-level module)")
    p.add_argument("-I", dest="include_dirs", action="append", default=[], metavar="DIR",
                   help="add an include directory")
    p.add_argument("-D", dest="defines", action="append", default=[], metavar="NAME[=VALUE]",
                   help="define a preprocessor macro")
    p.add_argument("files", nargs="*", metavar="FILE")
    args = p.parse_args(argv)
    if not args.files:
        p.error("no input files")
    return args


def _quote(arg):
    """Quote one argument for slang's command-line splitter."""
    if arg and not any(c in arg for c in ' \t\r\n"\'\\#'):
        return arg
    return '"' + arg.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _declared_modules(drv):
    """Names of the modules, interfaces and programs declared at file level."""
    from pyslang import syntax
    kinds = (syntax.SyntaxKind.ModuleDeclaration, syntax.SyntaxKind.InterfaceDeclaration,
             syntax.SyntaxKind.ProgramDeclaration)
    names = set()
    for tree in drv.syntaxTrees:
        for m in getattr(tree.root, "members", None) or []:
            if m.kind in kinds:
                names.add(m.header.name.valueText)
    return names


def main(argv=None):
    args = parse_args(sys.argv[1:] if argv is None else argv)
    try:
        import pyslang  # noqa: F401
        from pyslang import driver as sdriver
    except ImportError as exc:
        sys.stderr.write("kerf_read: cannot import pyslang (%s); run "
                         "'pip install -r requirements.txt' from the kerf source tree\n" % exc)
        return EXIT_NO_PYSLANG

    sys.dont_write_bytecode = True     # keep the source tree free of __pycache__
    import kerf_describe

    cmd = ["kerf_read"]
    for d in args.include_dirs:
        cmd += ["-I", d]
    for d in args.defines:
        cmd += ["-D", d]
    if args.top:
        cmd += ["--top", args.top]
    cmd += args.files

    drv = sdriver.Driver()
    drv.addStandardArgs()
    if not drv.parseCommandLine(" ".join(_quote(a) for a in cmd), sdriver.CommandLineOptions()):
        return EXIT_USAGE
    if not drv.processOptions():
        return EXIT_ERRORS
    parsed = drv.parseAllSources()
    if args.top and args.top not in _declared_modules(drv):
        ok = drv.reportParseDiags()
        drv.reportDiagnostics(True)
        if not parsed or not ok:
            return EXIT_ERRORS
        sys.stderr.write("kerf_read: module '%s' not found\n" % args.top)
        return EXIT_USAGE
    comp = drv.createCompilation()
    drv.reportCompilation(comp, True)
    ok = drv.reportDiagnostics(True)
    if not parsed or not ok:
        return EXIT_ERRORS

    tops = list(comp.getRoot().topInstances)
    if args.top:
        chosen = [t for t in tops if t.name == args.top or t.definition.name == args.top]
        if not chosen:
            sys.stderr.write("kerf_read: module '%s' not found\n" % args.top)
            return EXIT_USAGE
        top = chosen[0]
    else:
        if len(tops) != 1:
            if not tops:
                sys.stderr.write("kerf_read: no top-level module found in the given files\n")
            else:
                names = ", ".join(sorted(t.name for t in tops))
                sys.stderr.write("kerf_read: more than one top-level module (%s); choose one with "
                                 "--top NAME\n" % names)
            return EXIT_USAGE
        top = tops[0]

    try:
        for f in args.files:
            kerf_describe.GIVEN_FILES.setdefault(os.path.realpath(f), f)
        desc = kerf_describe.describe(comp, top)
    except Exception:
        import traceback
        traceback.print_exc()
        sys.stderr.write("kerf_read: internal error while describing module '%s'\n" % top.name)
        return EXIT_INTERNAL
    out = json.dumps(desc, separators=(",", ":"))
    try:
        sys.stdout.write(out)
        sys.stdout.write("\n")
        sys.stdout.flush()
    except BrokenPipeError:
        # the consumer went away; do not print a traceback about it
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
    return EXIT_OK


if __name__ == "__main__":
    sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
    # Generated logic nests deeply (a sum of thousands of products is a chain of
    # thousands of `|`): describe it on a thread with a large stack and a
    # recursion limit to match, instead of failing on long expressions.
    import threading
    sys.setrecursionlimit(1_000_000)
    threading.stack_size(1024 * 1024 * 1024)
    result = []

    def run():
        try:
            result.append(main())
        except SystemExit as e:
            result.append(e.code if isinstance(e.code, int) else 1)

    worker = threading.Thread(target=run)
    worker.start()
    worker.join()
    sys.exit(result[0] if result else 4)
