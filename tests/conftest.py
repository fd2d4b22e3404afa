import atexit
import os
import shutil
import sys
import tempfile
from pathlib import Path

# The tests import their helpers as ``support.*``.
sys.path.insert(0, str(Path(__file__).parent))

# The suite never reads or writes the user's start-up cache: one fresh cache folder per
# session (subprocesses inherit it), removed at the end.
_CACHE = tempfile.mkdtemp(prefix="retime-test-cache-")
os.environ["RETIME_CACHE"] = _CACHE
atexit.register(shutil.rmtree, _CACHE, ignore_errors=True)
