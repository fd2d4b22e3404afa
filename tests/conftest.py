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


import pytest  # noqa: E402


@pytest.fixture(scope="session")
def cat():
    """The shipped catalog folder, loaded once; a file with a problem fails here, by name.
    (Test modules that need the installed copy's loader define their own ``cat``.)"""
    from advisor.catalog import load_dirs

    c = load_dirs([Path(__file__).resolve().parents[1] / "catalog"])
    assert not c.problems, [str(p) for p in c.problems]
    return c
