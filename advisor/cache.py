"""A start-up cache for the validated catalog and the compiled rules.

Validating ~35 YAML families with pydantic and compiling ~50 rules costs more than
the rest of a ``retime check`` run. The validated objects are pickled in the user's
cache folder, keyed by the version and by every source file's path, size and
modification time, so an edited, added or removed YAML file is read afresh. The
pydantic models are declared with ``defer_build``: a cache hit never builds their
validation schemas. ``RETIME_NO_CACHE=1`` turns the cache off; an unwritable
cache folder simply means no cache.
"""

from __future__ import annotations

import hashlib
import os
import pickle
import sys
import tempfile
from pathlib import Path
from typing import Callable, TypeVar

from advisor import __version__

T = TypeVar("T")


def cache_dir() -> Path | None:
    if os.environ.get("RETIME_NO_CACHE") == "1":
        return None
    env = os.environ.get("RETIME_CACHE")
    if env:
        return Path(env)
    base = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(base) / "retime"


def _fingerprint(kind: str, dirs: list[Path]) -> str:
    material: list[object] = [__version__, sys.version_info[:2], kind]
    for d in dirs:
        material.append(str(d))
        try:
            entries = sorted(Path(d).glob("*.yaml"))
        except OSError:
            entries = []
        for p in entries:
            try:
                st = p.stat()
            except OSError:
                continue
            material.append((p.name, st.st_size, st.st_mtime_ns))
    return hashlib.sha1(repr(material).encode()).hexdigest()[:20]


def cached(kind: str, dirs: list[Path], build: Callable[[], T]) -> T:
    """``build()``'s result, from the cache when no file under ``dirs`` changed."""
    folder = cache_dir()
    if folder is None:
        return build()
    path = folder / f"{kind}-{_fingerprint(kind, dirs)}.pickle"
    try:
        with open(path, "rb") as fh:
            return pickle.load(fh)
    except FileNotFoundError:
        pass
    except Exception:  # a stale or damaged cache file is rebuilt, never trusted
        pass
    obj = build()
    try:
        folder.mkdir(parents=True, exist_ok=True)
        for old in folder.glob(f"{kind}-*.pickle"):
            if old != path:
                old.unlink(missing_ok=True)
        fd, tmp = tempfile.mkstemp(dir=folder, prefix=f".{kind}-")
        with os.fdopen(fd, "wb") as fh:
            pickle.dump(obj, fh, protocol=pickle.HIGHEST_PROTOCOL)
        os.replace(tmp, path)
    except (OSError, pickle.PicklingError, TypeError, AttributeError):
        pass
    return obj
