"""A stand-in for kerf's reader (KERF_READER): runs the real reader and damages its output at one place.

KERF_DAMAGE is "cut:N" (the output ends before byte N) or "nul:N" (a NUL byte, which JSON
allows nowhere, is put before byte N); N is a 0-based offset, a negative one from the end,
or a share of the length when it has a decimal point ("cut:0.37").
The offset used is written to KERF_DAMAGE_LOG, so the test can check where kerf says the
damage is.
"""
import os
import subprocess
import sys
r = subprocess.run([sys.executable, os.environ["KERF_REAL_READER"]] + sys.argv[1:], stdout=subprocess.PIPE)
out = r.stdout
how, at = os.environ["KERF_DAMAGE"].split(":")
at = int(float(at) * len(out)) if "." in at else int(at)
if at < 0:
    at += len(out)
at = max(0, min(at, len(out)))
out = out[:at] if how == "cut" else out[:at] + b"\0" + out[at:]
with open(os.environ["KERF_DAMAGE_LOG"], "a") as log:
    log.write(f"{at} {len(r.stdout)}\n")
sys.stdout.buffer.write(out)
sys.exit(r.returncode)
