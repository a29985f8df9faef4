"""Shared by the Python tests: the command line of the same install, for its --json output.

Environment (set by CTest, tests/CMakeLists.txt): PYTHONPATH holds the installed module,
EMBER_BINARY is the installed `ember`, EMBER_SOURCE_DIR the source tree.
"""
import json
import os
import subprocess
import tempfile

EMBER = os.environ.get("EMBER_BINARY", "ember")
SOURCE = os.environ.get("EMBER_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", ".."))

# Keep the tests' tables out of the user's cache.
_cache = tempfile.TemporaryDirectory(prefix="ember-python-cache-")
os.environ["EMBER_CACHE_DIR"] = _cache.name


def cli(*args, expect=0):
    """Runs `ember ARGS`; returns (stdout, stderr), checking the exit code."""
    done = subprocess.run([EMBER, *args], capture_output=True, text=True, timeout=600)
    if done.returncode != expect:
        raise AssertionError(f"ember {' '.join(args)}: exit {done.returncode}, expected {expect}: {done.stderr[:400]}")
    return done.stdout, done.stderr


def cli_json(*args):
    """`ember ARGS --json`, parsed."""
    return json.loads(cli(*args, "--json")[0])


def close(a, b, rel):
    return abs(a - b) <= rel * max(abs(a), abs(b))
