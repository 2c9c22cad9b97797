"""A stand-in for kerf's reader (KERF_READER) that prints something that is not a description."""
import sys
sys.stdout.write('{"format": "kerf-module", "version": 1, "module": {"name": 17}, "signals": [')
sys.exit(0)
