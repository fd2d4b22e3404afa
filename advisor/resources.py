"""Where shipped data lives: ``advisor/data/{catalog,rules,demo}`` beside the package.

In the repository those are symlinks to the top-level ``catalog/`` and ``rules/``
folders, so editable and normal installs read the same files through one code path.
The folder is found from the package's own location (what importlib.resources gives
for an installed package folder, without importing it and the archive modules behind it
on every start-up); importlib.resources is asked only when that folder is not there.
"""

from __future__ import annotations

import os
from pathlib import Path

_PACKAGE = Path(__file__).parent  # not resolved: the same path importlib.resources gives


def data_dir(name: str) -> Path:
    """Path of a shipped data folder (``catalog``, ``rules`` or ``demo``)."""
    here = _PACKAGE / "data" / name
    if here.is_dir():
        return here
    from importlib import resources

    return Path(str(resources.files("advisor") / "data" / name))


def user_dirs(name: str) -> list[Path]:
    """Extra folders that add or override shipped entries.

    ``RETIME_CATALOG`` / ``RETIME_RULES`` (os.pathsep-separated) and
    ``~/.config/retime/<name>`` when it exists.
    """
    out: list[Path] = []
    env = os.environ.get(f"RETIME_{name.upper()}")
    if env:
        out.extend(Path(p) for p in env.split(os.pathsep) if p)
    home = Path(os.environ.get("XDG_CONFIG_HOME", Path.home() / ".config")) / "retime" / name
    if home.is_dir():
        out.append(home)
    return out


def data_dirs(name: str, extra: tuple[str, ...] = ()) -> list[Path]:
    """Shipped folder first, then user folders, then ``extra`` (later ones override)."""
    return [data_dir(name), *user_dirs(name), *(Path(e) for e in extra)]
