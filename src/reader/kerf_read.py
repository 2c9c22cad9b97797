#!/usr/bin/env python3
"""kerf's Verilog/SystemVerilog reader.

Runs slang (through pyslang) on the user's files, elaborates one module and
prints its description as one compact JSON object on stdout, in the format
documented in docs/reader-format.md (`kerf-module`, version 3).

    python3 kerf_read.py [--top NAME] [-I DIR]... [-D NAME[=VALUE]]... [--param NAME=VALUE]... FILE...

Exit codes: 0 success; 1 slang reported errors (on stderr, in slang's own
format); 2 usage error, module not found or ambiguous; 3 pyslang missing;
4 internal error of the reader (a traceback on stderr); 5 out of memory;
6 the Python or pyslang version does not fit (kerf/io/reader.h maps these).

This file stays readable by old Python versions up to the version check, so
that an unsuitable interpreter gets a message instead of a syntax error.
"""

import sys

EXIT_OK = 0
EXIT_ERRORS = 1
EXIT_USAGE = 2
EXIT_NO_PYSLANG = 3
EXIT_INTERNAL = 4
EXIT_NO_MEMORY = 5
EXIT_WRONG_VERSION = 6

MIN_PYTHON = (3, 8)
# The pyslang release requirements.txt pins; another major release has another API.
PYSLANG_PIN = "12.1.0"

if sys.version_info < MIN_PYTHON:
    sys.stderr.write("kerf_read: Python %d.%d or newer is needed, this is %d.%d (set KERF_PYTHON)\n"
                     % (MIN_PYTHON[0], MIN_PYTHON[1], sys.version_info[0], sys.version_info[1]))
    sys.exit(EXIT_WRONG_VERSION)

import argparse  # noqa: E402
import gc  # noqa: E402
import json  # noqa: E402
import os  # noqa: E402


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
    p.add_argument("--param", dest="params", action="append", default=[], metavar="NAME=VALUE",
                   help="set a parameter of the top module (a top-level override)")
    p.add_argument("--as-built", action="store_true",
                   help="describe this build only: do not keep logic that depends on parameters an instance "
                        "could override or on the preprocessor (for proofs of one build)")
    p.add_argument("--read-back", metavar="TEXTS",
                   help="the file is kerf's own rewrite, read back to be measured and proved: describe only "
                        "what that needs (no comments, no named constants, match keys only for members whose "
                        "text is listed in TEXTS, one 'LENGTH CRC32' line per member text of the original)")
    p.add_argument("files", nargs="*", metavar="FILE")
    args = p.parse_args(argv)
    if not args.files:
        p.error("no input files")
    for a in args.params:
        name, eq, value = a.partition("=")
        if not eq or not name.strip() or not value.strip():
            p.error("--param takes NAME=VALUE, got '%s'" % a)
    return args


def _quote(arg):
    """Quote one argument for slang's command-line splitter."""
    if arg and not any(c in arg for c in ' \t\r\n"\'\\#'):
        return arg
    return '"' + arg.replace("\\", "\\\\").replace('"', '\\"') + '"'


def declared_modules(drv, kinds=None):
    """Names of the modules (by default also interfaces and programs) declared at file level,
    in the order of the files and of the declarations, each name once."""
    from pyslang import syntax
    if kinds is None:
        kinds = (syntax.SyntaxKind.ModuleDeclaration, syntax.SyntaxKind.InterfaceDeclaration,
                 syntax.SyntaxKind.ProgramDeclaration)
    names = []
    for tree in drv.syntaxTrees:
        for m in getattr(tree.root, "members", None) or []:
            if m.kind in kinds and m.header.name.valueText not in names:
                names.append(m.header.name.valueText)
    return names


def open_sources(prog, include_dirs, defines, files, extra=()):
    """Set up slang's driver for the given files with kerf's include directories and macro
    definitions and parse them (no elaboration). Returns (driver, parsed) or an exit code."""
    from pyslang import driver as sdriver
    cmd = [prog]
    for d in include_dirs:
        cmd += ["-I", d]
    for d in defines:
        cmd += ["-D", d]
    cmd += list(extra) + list(files)
    drv = sdriver.Driver()
    drv.addStandardArgs()
    if not drv.parseCommandLine(" ".join(_quote(a) for a in cmd), sdriver.CommandLineOptions()):
        return EXIT_USAGE
    if not drv.processOptions():
        return EXIT_ERRORS
    return drv, drv.parseAllSources()


def _out_of_memory(exc):
    """An import that failed only because a shared library could not be mapped into memory."""
    text = str(exc).lower()
    return "failed to map segment" in text or "cannot allocate memory" in text


# Elements of a big table encoded at a time (a table of a generated design holds millions).
JSON_CHUNK = 20000


def write_json(desc, out):
    """`desc` as one line of compact JSON on `out`, the same text as one `json.dumps` but
    the node tables written a piece at a time: the whole text in memory at once (and its
    encoded copy) was a tenth of the reader's peak on a generated design."""
    # A tree the describer built: no cycles to look for (a quarter of the encoding time).
    dumps = json.JSONEncoder(separators=(",", ":"), check_circular=False).encode
    from kerf_convert import LINKS_KEY, linked
    links = desc.get(LINKS_KEY, [])
    out.write("{")
    for i, (k, v) in enumerate((k, v) for k, v in desc.items() if k != LINKS_KEY):
        out.write(("," if i else "") + dumps(k) + ":")
        if k == "exprs":
            # binary nodes continuing a chain written as links (docs/reader-format.md, "Links")
            out.write("[")
            for j in range(0, len(v), JSON_CHUNK):
                part = dumps(linked(v, links, j, j + JSON_CHUNK))
                out.write(("," if j else "") + part[1:-1])
            out.write("]")
        elif isinstance(v, list) and len(v) > JSON_CHUNK:
            out.write("[")
            for j in range(0, len(v), JSON_CHUNK):
                part = dumps(v[j:j + JSON_CHUNK])
                out.write(("," if j else "") + part[1:-1])
            out.write("]")
        else:
            out.write(dumps(v))
    out.write("}\n")
    out.flush()


def main(argv=None):
    args = parse_args(sys.argv[1:] if argv is None else argv)
    try:
        import pyslang  # noqa: F401
    except MemoryError:
        raise
    except ImportError as exc:
        if _out_of_memory(exc):
            raise MemoryError(str(exc))
        sys.stderr.write("kerf_read: cannot import pyslang (%s); run "
                         "'pip install -r requirements.txt' from the kerf source tree\n" % exc)
        return EXIT_NO_PYSLANG
    found = str(getattr(pyslang, "__version__", "unknown"))
    if found.split(".")[0] != PYSLANG_PIN.split(".")[0]:
        sys.stderr.write("kerf_read: pyslang %s is installed, kerf needs %s; run "
                         "'pip install -r requirements.txt' from the kerf source tree\n" % (found, PYSLANG_PIN))
        return EXIT_WRONG_VERSION
    try:
        from pyslang import driver  # noqa: F401  (checked here for a clear message)
    except ImportError as exc:
        sys.stderr.write("kerf_read: cannot import pyslang's driver (%s); run "
                         "'pip install -r requirements.txt' from the kerf source tree\n" % exc)
        return EXIT_NO_PYSLANG

    sys.dont_write_bytecode = True     # keep the source tree free of __pycache__
    import kerf_describe

    extra = ["--allow-toplevel-iface-ports"]   # a module with interface ports is read on its own (F29)
    for a in args.params:
        extra += ["-G", a]
    if args.top:
        extra += ["--top", args.top]
    opened = open_sources("kerf_read", args.include_dirs, args.defines, args.files, extra)
    if isinstance(opened, int):
        return opened
    drv, parsed = opened
    if args.top and args.top not in declared_modules(drv):
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

    import kerf_params
    import kerf_variants
    pinned = {}
    for a in args.params:
        name, _, value = a.partition("=")
        pinned[name.strip()] = value.strip()
    bad = kerf_params.check_pinned(top.body, pinned)
    if bad is not None:
        sys.stderr.write("kerf_read: %s\n" % bad)
        return EXIT_USAGE
    kerf_variants.PINNED = pinned
    kerf_variants.DEFINES = [d.partition("=")[0] for d in args.defines]
    kerf_variants.AS_BUILT = args.as_built
    if args.read_back is not None:
        listed = set()
        try:
            with open(args.read_back) as f:
                for line in f:
                    parts = line.split()
                    if len(parts) == 2:
                        n, crc = int(parts[0]), int(parts[1])
                        listed.add((n, crc))
                        listed.add((n, None))
        except (OSError, ValueError) as exc:
            sys.stderr.write("kerf_read: cannot read the list of member texts '%s': %s\n" % (args.read_back, exc))
            return EXIT_USAGE
        kerf_describe.READ_BACK = listed

    # The description is millions of small lists and tuples that live to the end: the cyclic
    # collector's full passes over them were a tenth to a quarter of the describe time on a
    # generated design, and found nothing to free (the reader's peak is the same without
    # them). The few cycles the describer makes (nested recursive helpers) wait until the
    # process ends (or the collector is on again, for a caller of main in its own process).
    collecting = gc.isenabled()
    gc.disable()
    try:
        for f in args.files:
            kerf_describe.GIVEN_FILES.setdefault(os.path.realpath(f), f)
        desc = kerf_describe.describe(comp, top)
    except MemoryError:
        raise
    except Exception:
        import traceback
        traceback.print_exc()
        sys.stderr.write("kerf_read: internal error while describing module '%s'\n" % top.name)
        return EXIT_INTERNAL
    finally:
        if collecting:
            gc.enable()
    try:
        # The collector off here too: the links written (tuples, docs/reader-format.md "Links")
        # would start full passes over the whole description, which frees nothing.
        collecting = gc.isenabled()
        gc.disable()
        try:
            write_json(desc, sys.stdout)
        finally:
            if collecting:
                gc.enable()
    except BrokenPipeError:
        # the consumer went away; do not print a traceback about it
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
    return EXIT_OK


def end_with_parent():
    """On Linux, have the kernel end the reader when its parent (kerf) dies, even of a signal
    nothing can catch (SIGKILL, the out-of-memory killer): an orphaned reader would go on
    describing a design no one reads, at up to gigabytes on a generated one. kerf starts the
    reader from its main thread, so the parent's thread is the parent's life. A parent that
    died before the request is seen as a changed parent pid."""
    if not sys.platform.startswith("linux"):
        return
    parent = os.getppid()
    try:
        import ctypes
        import signal
        libc = ctypes.CDLL(None, use_errno=True)
        PR_SET_PDEATHSIG = 1
        if libc.prctl(PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0) != 0:
            return
    except (OSError, AttributeError, ImportError):
        return   # no prctl: the reader ends when it finds its output closed, as before
    if os.getppid() != parent:
        os._exit(EXIT_INTERNAL)   # the parent is already gone: no one reads the description


if __name__ == "__main__":
    end_with_parent()
    sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
    # Generated logic nests deeply (a sum of thousands of products is a chain of
    # thousands of `|`): describe it on a thread with a large stack and a
    # recursion limit to match, instead of failing on long expressions.
    import threading
    result = []

    def out_of_memory(what):
        try:
            sys.stderr.write("kerf_read: out of memory (%s)\n" % what)
        finally:
            os._exit(EXIT_NO_MEMORY)

    def run():
        try:
            result.append(main())
        except SystemExit as e:
            result.append(e.code if isinstance(e.code, int) else 1)
        except MemoryError:
            out_of_memory("while describing the design")
        except BaseException:
            import traceback
            traceback.print_exc()
            result.append(EXIT_INTERNAL)

    try:
        sys.setrecursionlimit(1000000)
        threading.stack_size(1024 * 1024 * 1024)
        worker = threading.Thread(target=run)
        worker.start()
    except (MemoryError, RuntimeError) as exc:
        # Under a memory limit the large stack cannot be had.
        out_of_memory("cannot start the reader's thread: %s" % exc)
    worker.join()
    sys.exit(result[0] if result else EXIT_INTERNAL)
