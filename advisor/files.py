"""Reading input files with bounds, and writing output files atomically.

Reading (:func:`read_regular`): only a regular file is read, never a FIFO, a device
(``/dev/zero``) or a socket: those would hang a run or fill its memory. The file is
opened without blocking (``O_NONBLOCK``: opening a FIFO for reading would otherwise
wait for a writer), its type is checked on the open descriptor, and at most the
kind's size limit is read; a larger file is refused with its size and the limit.

Writing (:func:`atomic_write`): the data goes to a temporary file in the target's own
folder (so the rename cannot cross file systems), is flushed to the disk (``fsync``),
given the mode an ordinary new file gets under the user's umask (0644 under umask
022, where ``mkstemp`` alone would leave 0600), and renamed over the target in one
step. A failure, Ctrl-C or SIGTERM during the write removes the temporary file, so
no half-written output and no stray temporary file is left behind. A target that
exists and is not a regular file (a device such as ``/dev/null`` or ``/dev/full``, a
FIFO, a folder, or a symbolic link to one) is refused before anything is written
(:func:`refuse_unwritable_target`): the rename would otherwise put a plain file in
place of a device node when run as root. The commands check their output flags with
the same function when the command line is read (``advisor.cli.options.output_path``),
so nothing is computed or written when one of them is refused.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

from advisor.errors import InputError, RetimeError

#: Per-kind size limits (bytes). Generous for real files: the largest shipped catalog
#: file is about 10 kB, a 10 000-line BOM about 1 MB, a 1-million-sample capture 40 MB.
SIZE_LIMITS = {
    "catalog": 1 << 20,  # 1 MiB per family file
    "rules": 1 << 20,
    "bom": 64 << 20,
    "capture": 256 << 20,
    "cache": 64 << 20,
}


class FileRefused(RetimeError):
    """A file that is not read: missing, not a regular file, or over its size limit."""


def read_regular(path: str | os.PathLike, kind: str, *, limit: int | None = None) -> bytes:
    """The bytes of ``path`` when it is a regular file within ``kind``'s size limit.

    Raises :class:`FileRefused` (exit 2) naming the path and the reason.
    """
    p = str(path)
    cap = SIZE_LIMITS[kind] if limit is None else limit
    try:
        fd = os.open(p, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_CLOEXEC", 0))
    except FileNotFoundError:
        raise FileRefused(f"{p!r}: no such file") from None
    except IsADirectoryError:
        raise FileRefused(f"{p!r} is a folder, not a file") from None
    except OSError as exc:
        raise FileRefused(f"{p!r}: cannot open ({exc.strerror or exc})") from None
    try:
        st = os.fstat(fd)
        if stat.S_ISDIR(st.st_mode):
            raise FileRefused(f"{p!r} is a folder, not a file")
        if not stat.S_ISREG(st.st_mode):
            raise FileRefused(f"{p!r} is not a regular file ({_kind_of(st.st_mode)}); only ordinary files are read")
        if st.st_size > cap:
            raise FileRefused(f"{p!r} is {_size(st.st_size)}; the limit for a {kind} file is {_size(cap)}")
        if hasattr(os, "set_blocking"):
            os.set_blocking(fd, True)
        chunks, total = [], 0
        while True:
            chunk = os.read(fd, min(1 << 20, cap + 1 - total))
            if not chunk:
                break
            chunks.append(chunk)
            total += len(chunk)
            if total > cap:  # the file grew while being read
                raise FileRefused(f"{p!r} is over {_size(cap)}, the limit for a {kind} file")
        return b"".join(chunks)
    except OSError as exc:
        raise FileRefused(f"{p!r}: cannot read ({exc.strerror or exc})") from None
    finally:
        os.close(fd)


def read_regular_text(path: str | os.PathLike, kind: str, *, encoding: str = "utf-8") -> str:
    """:func:`read_regular` decoded (UnicodeDecodeError propagates for the caller to locate)."""
    return read_regular(path, kind).decode(encoding)


def _kind_of(mode: int) -> str:
    if stat.S_ISFIFO(mode):
        return "a FIFO"
    if stat.S_ISCHR(mode):
        return "a character device"
    if stat.S_ISBLK(mode):
        return "a block device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not an ordinary file"


def _size(n: int) -> str:
    for unit, scale in (("GiB", 1 << 30), ("MiB", 1 << 20), ("kiB", 1 << 10)):
        if n >= scale:
            return f"{n / scale:.1f} {unit}"
    return f"{n} bytes"


def current_umask() -> int:
    """The process umask (read by setting and restoring it)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


class _Terminated(SystemExit):
    """SIGTERM during a write: unwinds like an exit so the temporary file is removed."""


def _on_sigterm(signum, frame):
    raise _Terminated(128 + signum)


def target_problem(path: str | os.PathLike) -> str | None:
    """Why ``path`` cannot be an output file (None: it is a regular file or not there yet).

    The target is looked at through a symbolic link (``os.stat``), so a link to
    ``/dev/null`` is a device here too; a dangling link or a missing file is fine
    (the write creates the file).
    """
    p = str(path)
    try:
        st = os.stat(p)
    except (FileNotFoundError, NotADirectoryError):
        return None
    except OSError:
        return None  # the write itself will say why (permission, loop), with the path
    if stat.S_ISREG(st.st_mode):
        return None
    kind = "a folder" if stat.S_ISDIR(st.st_mode) else _kind_of(st.st_mode)
    if os.path.islink(p):
        kind = f"a symbolic link to {kind} ({os.path.realpath(p)!r})"
    return f"{p!r} is {kind}, not a regular file; nothing was written (name an ordinary file)"


def refuse_unwritable_target(path: str | os.PathLike, what: str = "output") -> None:
    """Raise :class:`FileRefused` (exit 2, one line naming ``what`` and the path) when
    ``path`` exists and is not a regular file."""
    why = target_problem(path)
    if why is not None:
        raise FileRefused(f"{what} {why}")


def atomic_write(path: str | os.PathLike, data: bytes, *, what: str = "output") -> Path:
    """Write ``data`` to ``path`` atomically (see the module docstring); returns the path.

    A target that is not a regular file is refused (:func:`refuse_unwritable_target`);
    a missing folder is an :class:`InputError`; an OS error (read-only folder, full disk)
    is re-raised as an ``OSError`` naming the folder or the target (the CLI prints
    ``path: reason`` and exits 2); the temporary file is removed on every exit path.
    """
    import signal
    import tempfile
    import threading

    target = Path(path)
    refuse_unwritable_target(target, what)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"{what} {str(target)!r}: folder {str(folder)!r} does not exist")
    main = threading.current_thread() is threading.main_thread()
    previous = None
    if main:
        try:
            previous = signal.signal(signal.SIGTERM, _on_sigterm)
        except (ValueError, OSError):  # pragma: no cover - no signals here
            main = False
    tmp: str | None = None
    try:
        try:
            fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
        except OSError as exc:  # the CLI prints "path: reason" and exits 2 (advisor.cli.main)
            raise OSError(exc.errno, exc.strerror or str(exc), str(folder)) from None
        try:
            with os.fdopen(fd, "wb") as fh:
                fh.write(data)
                fh.flush()
                os.fsync(fh.fileno())
            os.chmod(tmp, 0o666 & ~current_umask())  # mkstemp makes 0600; outputs are ordinary files
            refuse_unwritable_target(target, what)  # again: it may have become a device meanwhile
            os.replace(tmp, target)
            tmp = None
        except OSError as exc:
            raise OSError(exc.errno, exc.strerror or str(exc), str(target)) from None
    finally:
        if tmp is not None:
            try:
                os.unlink(tmp)
            except OSError:
                pass
        if main:
            signal.signal(signal.SIGTERM, previous if previous is not None else signal.SIG_DFL)
    return target
