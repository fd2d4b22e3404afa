"""A start-up cache for the validated catalog and the compiled rules, as plain JSON.

Validating ~40 YAML families with pydantic and compiling ~50 rules costs more than
the rest of a ``retime check`` run, so the validated data is kept in the user's
cache folder (``$RETIME_CACHE``, else ``$XDG_CACHE_HOME/retime``, else
``~/.cache/retime``; ``RETIME_NO_CACHE=1`` turns it off).

What keeps it honest:

- Data only. The file is JSON: loading it can build lists, dicts, strings and
  numbers, never objects of arbitrary classes, so a file planted in the cache folder
  cannot run code (a pickle could). Objects are rebuilt by :func:`rebuild` from the
  model classes' own field types.
- Checked on read. The file names its format, kind and key; :func:`rebuild` checks
  every value against the field's declared type (strings, finite numbers, literal
  choices, required fields, no unknown keys) while it rebuilds. Anything that does
  not match is rebuilt from the YAML and the file rewritten.
- Keyed by what made it. The key hashes the version, the Python version, every YAML
  file's name, size and modification time, and the *contents* of the source files that
  define the grammar and the rules vocabulary (:data:`GRAMMAR_FILES`), so a changed
  validator, law or context name is never answered from an old cache.
- Fast on a hit. The grammar classes are :mod:`advisor.record` records, rebuilt here
  from checked values: a cache hit never imports pydantic nor builds a validation schema.
- Written atomically (:func:`advisor.files.atomic_write`): a failed write leaves no
  temporary file; an unwritable cache folder simply means no cache.
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
import math
import os
import sys
import types
import typing
from pathlib import Path
from typing import Any, Callable, TypeVar

from advisor import __version__

T = TypeVar("T")

#: Cache file layout version (bump when the envelope changes).
FORMAT = 1

#: Source files (relative to the ``advisor`` package) whose contents are part of the
#: key: the catalog grammar and loader, the rules grammar, vocabulary, compiler and
#: loader, the laws registry, and this module. Missing names are skipped.
GRAMMAR_FILES = (
    "parts.py", "catalog.py", "cache.py", "files.py", "yamlload.py", "errors.py", "resources.py",
    "rules/model.py", "rules/context.py", "rules/loader.py", "rules/engine.py",
    "rules/safe_expr.py", "rules/template.py", "timing/laws.py", "timing/registry.py", "findings.py",
    "overrides.py", "record.py", "makers.py",
)

_PACKAGE = Path(__file__).resolve().parent


def cache_dir() -> Path | None:
    if os.environ.get("RETIME_NO_CACHE") == "1":
        return None
    env = os.environ.get("RETIME_CACHE")
    if env:
        return Path(env)
    base = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(base) / "retime"


def code_hash(root: Path = _PACKAGE, files: tuple[str, ...] = GRAMMAR_FILES) -> str:
    """SHA-256 over the contents of the grammar-defining source files under ``root``."""
    h = hashlib.sha256()
    for rel in files:
        try:
            data = (root / rel).read_bytes()
        except OSError:
            continue
        h.update(rel.encode() + b"\0" + len(data).to_bytes(8, "little") + data)
    return h.hexdigest()


def fingerprint(kind: str, dirs: list[Path], code: str | None = None) -> str:
    """The cache key: version, Python, kind, grammar code hash and every YAML file's stat."""
    material: list[object] = [FORMAT, __version__, sys.version_info[:2], kind, code or code_hash()]
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
            material.append((p.name, st.st_size, st.st_mtime_ns, st.st_ino))
    return hashlib.sha256(repr(material).encode()).hexdigest()


def cached(
    kind: str,
    dirs: list[Path],
    build: Callable[[], T],
    dump: Callable[[T], Any],
    load: Callable[[Any], T],
) -> T:
    """``build()``'s result, from the cache when its key matches.

    ``dump(obj)`` gives JSON-ready data and ``load(data)`` rebuilds the object from
    it, raising :class:`CacheMismatch` (or any ValueError/TypeError/KeyError) when
    the data does not have the expected shape.
    """
    folder = cache_dir()
    if folder is None:
        return build()
    key = fingerprint(kind, dirs)
    path = folder / f"{kind}.json"
    hit = _read(path, kind, key, load)
    if hit is not None:
        return hit
    obj = build()
    try:
        text = json.dumps({"format": FORMAT, "kind": kind, "key": key, "data": dump(obj)},
                          ensure_ascii=False, allow_nan=False, separators=(",", ":"))
        _write(folder, path, text.encode("utf-8"))
    except (ValueError, TypeError, CacheMismatch):  # not representable: no cache this time
        pass
    return obj


def drop(kind: str) -> None:
    """Remove ``kind``'s cache file (a cached value turned out not to rebuild)."""
    folder = cache_dir()
    if folder is not None:
        try:
            (folder / f"{kind}.json").unlink(missing_ok=True)
        except OSError:
            pass


class CacheMismatch(ValueError):
    """Cached data that does not fit the model it should rebuild."""


def _read(path: Path, kind: str, key: str, load: Callable[[Any], T]) -> T | None:
    from advisor.files import FileRefused, read_regular

    try:
        raw = read_regular(path, "cache")
    except FileRefused:
        return None
    try:
        doc = json.loads(raw)
        if not (isinstance(doc, dict) and doc.get("format") == FORMAT and doc.get("kind") == kind
                and doc.get("key") == key):
            return None
        return load(doc["data"])
    except (ValueError, TypeError, KeyError, AttributeError, IndexError, NameError, RecursionError):
        return None  # damaged, stale or foreign: rebuilt, never trusted


def _write(folder: Path, path: Path, data: bytes) -> None:
    from advisor.errors import RetimeError
    from advisor.files import atomic_write

    try:
        folder.mkdir(parents=True, exist_ok=True)
        atomic_write(path, data, what="cache")
        for old in folder.glob(f"{path.stem}-*.pickle"):  # the previous layout's files
            old.unlink(missing_ok=True)
    except (OSError, RetimeError):
        pass


# --- plain data out of models and back ------------------------------------------------


def to_data(obj: object) -> object:
    """JSON-ready data from records (advisor.record), pydantic models, dataclasses, lists, dicts and scalars."""
    if obj is None or isinstance(obj, (str, bool, int)):
        return obj
    if isinstance(obj, float):
        if not math.isfinite(obj):
            raise CacheMismatch("a non-finite number is not cached")
        return obj
    if hasattr(obj, "model_dump") and hasattr(type(obj), "model_fields"):
        # Only the fields the file set: defaults are filled again when rebuilt.
        return {name: to_data(getattr(obj, name)) for name in type(obj).model_fields if name in obj.model_fields_set}
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        return {f.name: to_data(getattr(obj, f.name)) for f in dataclasses.fields(obj)}
    if isinstance(obj, (list, tuple)):
        return [to_data(v) for v in obj]
    if isinstance(obj, dict):
        return {str(k): to_data(v) for k, v in obj.items()}
    raise CacheMismatch(f"cannot cache a {type(obj).__name__}")


def rebuild(tp: object, data: object) -> Any:
    """An instance of type ``tp`` from :func:`to_data`'s output, type-checked on the way.

    Supports records (:mod:`advisor.record`) and pydantic models (made the way
    ``model_construct`` makes them: no validation schema is built), dataclasses, ``list``/``tuple``/``dict``/``Literal``/``Optional``/``Union``/
    ``Annotated`` and the scalars. Raises :class:`CacheMismatch` on any mismatch.
    """
    return _converter(tp)(data)


_CONVERTERS: dict[object, Callable[[object], object]] = {}


def _converter(tp: object) -> Callable[[object], object]:
    try:
        return _CONVERTERS[tp]
    except (KeyError, TypeError):
        pass
    conv = _make_converter(tp)
    try:
        _CONVERTERS[tp] = conv
    except TypeError:  # pragma: no cover - unhashable annotation
        pass
    return conv


class _Wrong(CacheMismatch):
    """A value of the wrong type (message built only when shown: unions try members)."""

    def __init__(self, what: str, value: object) -> None:
        super().__init__(what)
        self.what, self.value = what, value

    def __str__(self) -> str:
        return f"expected {self.what}, got {repr(self.value)[:40]}"


_fail = _Wrong


def _make_converter(tp: object) -> Callable[[object], object]:  # noqa: C901 - one branch per type form
    origin = typing.get_origin(tp)
    args = typing.get_args(tp)
    if origin is typing.Annotated:
        return _converter(args[0])
    if tp is Any or tp is object:
        return _plain
    if tp is type(None):
        def none(v):
            if v is not None:
                raise _fail("null", v)
            return None
        return none
    if tp is str:
        def string(v):
            if type(v) is not str:
                raise _fail("text", v)
            return v
        return string
    if tp is bool:
        def boolean(v):
            if type(v) is not bool:
                raise _fail("true/false", v)
            return v
        return boolean
    if tp is int:
        def integer(v):
            if type(v) is not int:
                raise _fail("an integer", v)
            return v
        return integer
    if tp is float:
        def number(v):
            if type(v) is float:
                if not math.isfinite(v):
                    raise _fail("a finite number", v)
                return v
            if type(v) is int:
                return float(v)
            raise _fail("a number", v)
        return number
    if origin is typing.Literal:
        allowed = {(type(a), a) for a in args}

        def literal(v):
            if (type(v), v) not in allowed:
                raise _fail(f"one of {args}", v)
            return v
        return literal
    if origin in (typing.Union, types.UnionType):
        members = [_converter(a) for a in args if a is not type(None)]
        if len(members) == 1 and type(None) in args:
            only = members[0]

            def optional(v):
                return None if v is None else only(v)
            return optional
        if type(None) in args:
            members.insert(0, _converter(type(None)))

        def union(v):
            for m in members:
                try:
                    return m(v)
                except CacheMismatch:
                    continue
            raise _fail(f"a {tp}", v)
        return union
    if tp is list or origin is list:
        item = _converter(args[0]) if args else _plain

        def listing(v):
            if type(v) is not list:
                raise _fail("a list", v)
            return [item(x) for x in v]
        return listing
    if tp is tuple or origin is tuple:
        if len(args) == 2 and args[1] is Ellipsis:
            each = _converter(args[0])

            def tuple_any(v):
                if type(v) is not list:
                    raise _fail("a list", v)
                return tuple(each(x) for x in v)
            return tuple_any
        fixed = [_converter(a) for a in args]

        def tuple_fixed(v):
            if type(v) is not list or (fixed and len(v) != len(fixed)):
                raise _fail(f"a list of {len(fixed)}", v)
            return tuple(c(x) for c, x in zip(fixed, v)) if fixed else tuple(v)
        return tuple_fixed
    if tp is dict or origin is dict:
        value = _converter(args[1]) if len(args) == 2 else _plain

        def mapping(v):
            if type(v) is not dict:
                raise _fail("a mapping", v)
            return {k: value(x) for k, x in v.items()}
        return mapping
    if _is_model(tp):
        return _model_converter(tp)
    if isinstance(tp, type) and dataclasses.is_dataclass(tp):
        return _dataclass_converter(tp)
    raise CacheMismatch(f"type {tp!r} is not cached")


def _plain(v: object) -> object:
    """Any JSON value, checked for finite numbers all the way down."""
    if isinstance(v, float) and not math.isfinite(v):
        raise _fail("a finite number", v)
    if isinstance(v, list):
        return [_plain(x) for x in v]
    if isinstance(v, dict):
        return {k: _plain(x) for k, x in v.items()}
    return v


_MISSING = object()


def _model_converter(cls: type) -> Callable[[object], object]:
    """Rebuild a record or a pydantic model without validation schemas: the instance is
    made from its values and fields-set (a record's ``_record_make``; for pydantic the way
    ``model_construct`` makes it), after every value has been type-checked here."""
    fields = cls.model_fields
    make = getattr(cls, "_record_make", None)  # an advisor.record class: made from checked values
    plan: list[tuple[str, Callable[[object], object], bool, object]] = []
    names = frozenset(fields)
    new = object.__new__
    setattr_ = object.__setattr__

    def model(v):
        if not plan:
            for name, info in fields.items():
                plan.append((name, _converter(info.annotation), info.is_required(), info))
        if type(v) is not dict:
            raise _fail(f"a {cls.__name__} mapping", v)
        if not names.issuperset(v):
            raise CacheMismatch(f"{cls.__name__}: unknown keys {sorted(set(v) - names)[:3]}")
        values = {}
        for name, conv, required, info in plan:
            item = v.get(name, _MISSING)
            if item is _MISSING:
                if required:
                    raise CacheMismatch(f"{cls.__name__}: {name} missing")
                factory = info.default_factory
                if factory is not None:
                    # A model class as its own default is rebuilt here too: calling it
                    # would build its validation schema.
                    values[name] = _converter(factory)({}) if _is_model(factory) else factory()
                else:  # info.get_default would import pydantic's deep-copy helpers on every call
                    d = info.default
                    values[name] = d.copy() if isinstance(d, (list, dict, set)) else d
                continue
            values[name] = conv(item)
        if make is not None:
            return make(values, set(v))
        obj = new(cls)
        setattr_(obj, "__dict__", values)
        setattr_(obj, "__pydantic_fields_set__", set(v))
        setattr_(obj, "__pydantic_extra__", None)
        setattr_(obj, "__pydantic_private__", None)
        return obj
    return model


def _is_model(tp: object) -> bool:
    """A grammar record (advisor.record) or a pydantic model class."""
    return isinstance(tp, type) and hasattr(tp, "model_fields") and (
        hasattr(tp, "_record_make") or hasattr(tp, "model_construct"))


def _dataclass_converter(cls: type) -> Callable[[object], object]:
    try:
        hints = typing.get_type_hints(cls, include_extras=True)
    except NameError as exc:  # an annotation this module cannot resolve: not cached
        raise CacheMismatch(f"{cls.__name__}: {exc}") from None
    plan = {}
    for f in dataclasses.fields(cls):
        required = f.default is dataclasses.MISSING and f.default_factory is dataclasses.MISSING
        plan[f.name] = (_lazy(hints.get(f.name, Any)), required, f.init)

    def dataclass_(v):
        if type(v) is not dict:
            raise _fail(f"a {cls.__name__} mapping", v)
        extra = v.keys() - plan.keys()
        if extra:
            raise CacheMismatch(f"{cls.__name__}: unknown keys {sorted(extra)[:3]}")
        values = {}
        for name, (conv, required, init) in plan.items():
            item = v.get(name, _MISSING)
            if item is _MISSING:
                if required:
                    raise CacheMismatch(f"{cls.__name__}: {name} missing")
                continue
            if init:
                values[name] = conv(item)
        return cls(**values)
    return dataclass_


def _lazy(tp: object) -> Callable[[object], object]:
    """A converter built on first use (models refer to each other)."""
    box: list[Callable[[object], object]] = []

    def conv(v):
        if not box:
            box.append(_converter(tp))
        return box[0](v)
    return conv
