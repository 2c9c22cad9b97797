"""A stand-in for kerf's reader (KERF_READER) that makes kerf's own rewrite wrong.

When asked to read a file under $TMPDIR (where kerf keeps the rewrite it is
proving), it first inverts the right-hand side of the last generated
assignment in that file (an output of the module), then runs the real
reader. kerf must then find its rewrite not equivalent, write nothing and
keep the evidence for a bug report.
"""
import os
import re
import subprocess
import sys

BEGIN, END = "kerf: restructured logic", "kerf: end of restructured logic"
tmp = os.path.realpath(os.environ["TMPDIR"])
for a in sys.argv[1:]:
    if os.path.isfile(a) and os.path.realpath(a).startswith(tmp + os.sep):
        text = open(a).read()
        b, e = text.index(BEGIN), text.index(END)
        block = text[b:e]
        last = list(re.finditer(r"(\n\s*(?:assign\s+)?[\w\[\]:]+\s*=\s*)([^;]+);", block))[-1]
        block = block[:last.start()] + last.group(1) + "~(" + last.group(2) + ");" + block[last.end():]
        open(a, "w").write(text[:b] + block + text[e:])
sys.exit(subprocess.run([sys.executable, os.environ["KERF_REAL_READER"]] + sys.argv[1:]).returncode)
