"""Frozen records for the catalog and rules grammar, validated by pydantic only when data is read.

The grammar (:mod:`advisor.parts`, :mod:`advisor.makers`, :mod:`advisor.rules.model`) is
written as classes of :class:`Record`: annotated fields, :func:`Field` defaults and
constraints, :func:`field_validator` / :func:`model_validator` checks, and methods, in the
shape pydantic models are written. Defining them costs no more than defining plain
classes: annotations stay text, nothing is imported.

Reading YAML goes through ``Record.model_validate(data)``: on first use it builds, for each
record class, a pydantic model with the same name, fields, constraints, validators and
configuration (frozen, unknown keys refused), validates with it (so messages and error
locations are pydantic's), and turns the result into records. A run answered from the
start-up cache (:mod:`advisor.cache`) rebuilds records from type-checked JSON and never
imports pydantic: the import and the validation schemas are what cost most at start-up.

Records behave like frozen pydantic models where the code uses them: attribute access,
``model_fields`` (name -> field info with ``annotation``, ``default``, ``default_factory``,
``is_required()``), ``model_fields_set`` (the fields the data gave), ``model_dump(mode=...,
exclude=..., exclude_none=...)``, ``model_copy(update=...)``, equality of type and values, ``repr``, copying and
pickling; setting an attribute is refused.
"""

from __future__ import annotations

import copy
import sys
import typing

_MISSING = object()

_FIELD_OPTIONS = frozenset({"min_length", "max_length", "pattern", "ge", "gt", "le", "lt", "strict"})


class _Spec:
    """One field: its default or default factory and the pydantic constraints it carries."""

    __slots__ = ("default", "default_factory", "constraints")

    def __init__(self, default=_MISSING, default_factory=None, constraints=None) -> None:
        self.default = default
        self.default_factory = default_factory
        self.constraints = dict(constraints or {})


def Field(default=_MISSING, *, default_factory=None, **constraints):  # noqa: N802 - pydantic's spelling
    """A field's default (or ``default_factory``) and constraints (``min_length``, ``pattern``, ...)."""
    unknown = set(constraints) - _FIELD_OPTIONS
    if unknown:
        raise TypeError(f"Field: unsupported options {sorted(unknown)}")
    return _Spec(default, default_factory, constraints)


class _Check:
    """A validator written in a record class; pydantic's decorator is applied when the model is built."""

    __slots__ = ("kind", "fields", "mode", "func")

    def __init__(self, kind: str, fields: tuple[str, ...], mode: str, func) -> None:
        self.kind, self.fields, self.mode, self.func = kind, fields, mode, func


def field_validator(*fields: str, mode: str = "after"):
    """Like ``pydantic.field_validator`` (put it above ``@classmethod``)."""
    return lambda func: _Check("field", fields, mode, func)


def model_validator(*, mode: str):
    """Like ``pydantic.model_validator``."""
    return lambda func: _Check("model", (), mode, func)


class FieldInfo:
    """What the code and the cache read about a field (the names pydantic's FieldInfo uses)."""

    __slots__ = ("name", "annotation", "default", "default_factory", "_required")

    def __init__(self, name: str, annotation, spec: _Spec) -> None:
        self.name = name
        self.annotation = annotation
        self.default = None if spec.default is _MISSING else spec.default
        self.default_factory = spec.default_factory
        self._required = spec.default is _MISSING and spec.default_factory is None

    def is_required(self) -> bool:
        return self._required


class _PerClass:
    """A class-level attribute computed from the class (read on the class or an instance)."""

    def __init__(self, func) -> None:
        self.func = func

    def __get__(self, obj, owner):
        return self.func(owner)


def _annotations(cls, extra: dict | None = None) -> dict[str, object]:
    """Each field's annotation resolved in the module of the class that declared it
    (``extra`` names first)."""
    hints = typing.get_type_hints(cls, localns=extra, include_extras=True)
    return {name: hints[name] for name in cls._record_specs}


def _model_fields(cls) -> dict[str, FieldInfo]:
    got = cls.__dict__.get("_record_infos")
    if got is None:
        hints = _annotations(cls)
        got = {name: FieldInfo(name, hints[name], spec) for name, spec in cls._record_specs.items()}
        type.__setattr__(cls, "_record_infos", got)
    return got


class Record:
    """Base of the grammar's frozen records (see the module docstring)."""

    __slots__ = ("__dict__", "_record_set")

    #: pydantic configuration beyond frozen and ``extra="forbid"`` (e.g. ``allow_inf_nan``).
    model_config: typing.ClassVar[dict] = {}
    #: Extra names for resolving annotations when the pydantic model is built (a callable
    #: returning a dict), for types that exist only with pydantic (strict scalars).
    _record_validation_names: typing.ClassVar[object] = None
    _record_specs: typing.ClassVar[dict] = {}
    _record_checks: typing.ClassVar[dict] = {}

    def __init_subclass__(cls, **kwargs) -> None:
        super().__init_subclass__(**kwargs)
        specs: dict[str, _Spec] = {}
        checks: dict[str, _Check] = {}
        for base in reversed(cls.__mro__[1:]):
            specs.update(base.__dict__.get("_record_specs", {}))
            checks.update(base.__dict__.get("_record_checks", {}))
        for name, annotation in cls.__dict__.get("__annotations__", {}).items():
            if name.startswith("_") or "ClassVar" in str(annotation):
                continue
            value = cls.__dict__.get(name, _MISSING)
            spec = value if isinstance(value, _Spec) else _Spec(default=value)
            if value is not _MISSING:
                type.__delattr__(cls, name)
            specs[name] = spec  # an overriding field keeps its place (pydantic's order)
        for name, value in list(cls.__dict__.items()):
            if isinstance(value, _Check):
                checks[name] = value
                type.__delattr__(cls, name)
        cls._record_specs = specs
        cls._record_checks = checks

    model_fields = _PerClass(_model_fields)

    # --- made from data -----------------------------------------------------------------

    @classmethod
    def _record_make(cls, values: dict, fields_set: set) -> "Record":
        """An instance from already checked values (every field present, in field order)."""
        obj = object.__new__(cls)
        object.__setattr__(obj, "__dict__", values)
        object.__setattr__(obj, "_record_set", fields_set)
        return obj

    @classmethod
    def model_validate(cls, data: object) -> "Record":
        """Validate ``data`` (a mapping, as read from YAML) with the pydantic model of this
        class; raises ``pydantic.ValidationError``."""
        return _from_model(cls, pydantic_model(cls).model_validate(data))

    def __init__(self, **data) -> None:
        done = type(self).model_validate(data)
        object.__setattr__(self, "__dict__", done.__dict__)
        object.__setattr__(self, "_record_set", done._record_set)

    @property
    def model_fields_set(self) -> set[str]:
        return self._record_set

    def model_dump(self, *, mode: str = "python", exclude=None, exclude_none: bool = False) -> dict:
        """All fields in order as plain data (nested records too); ``exclude`` names fields to
        leave out, ``exclude_none`` leaves out fields that are None (in nested records too)."""
        return {name: _dump(value, mode, exclude_none) for name, value in self.__dict__.items()
                if not (exclude and name in exclude) and not (exclude_none and value is None)}

    def model_copy(self, *, update: dict | None = None, deep: bool = False) -> "Record":
        """A copy with ``update``'s fields replaced (not validated, as pydantic's model_copy)."""
        values = copy.deepcopy(self.__dict__) if deep else dict(self.__dict__)
        fields_set = set(self._record_set)
        for name, value in (update or {}).items():
            if name not in values:
                raise TypeError(f"{type(self).__name__} has no field {name!r}")
            values[name] = value
            fields_set.add(name)
        return type(self)._record_make(values, fields_set)

    # --- frozen value semantics -----------------------------------------------------------

    def __setattr__(self, name: str, value) -> None:
        raise TypeError(f"{type(self).__name__} is frozen: {name} cannot be set")

    def __delattr__(self, name: str) -> None:
        raise TypeError(f"{type(self).__name__} is frozen: {name} cannot be deleted")

    def __eq__(self, other: object) -> bool:
        if type(other) is not type(self):
            return NotImplemented
        return self.__dict__ == other.__dict__

    def __hash__(self) -> int:
        return hash((type(self), *self.__dict__.values()))

    def __repr__(self) -> str:
        inner = ", ".join(f"{name}={value!r}" for name, value in self.__dict__.items())
        return f"{type(self).__name__}({inner})"

    def __copy__(self) -> "Record":
        return type(self)._record_make(dict(self.__dict__), set(self._record_set))

    def __deepcopy__(self, memo: dict) -> "Record":
        return type(self)._record_make(copy.deepcopy(self.__dict__, memo), set(self._record_set))

    def __reduce__(self):
        return (_remake, (type(self), self.__dict__, self._record_set))


def _remake(cls, values: dict, fields_set: set) -> Record:
    return cls._record_make(dict(values), set(fields_set))


def _dump(value, mode: str, exclude_none: bool):
    if isinstance(value, Record):
        return value.model_dump(mode=mode, exclude_none=exclude_none)
    if isinstance(value, list) or (mode == "json" and isinstance(value, tuple)):
        return [_dump(v, mode, exclude_none) for v in value]
    if isinstance(value, tuple):
        return tuple(_dump(v, mode, exclude_none) for v in value)
    if isinstance(value, dict):
        return {k: _dump(v, mode, exclude_none) for k, v in value.items()}
    return value


# --- the pydantic side (imported only when data is validated) ----------------------------

_MODELS: dict[type, type] = {}  # record class -> its pydantic model
_RECORDS: dict[type, type] = {}  # pydantic model -> its record class


def pydantic_model(cls: type) -> type:
    """The pydantic model that validates data for record class ``cls`` (built once)."""
    got = _MODELS.get(cls)
    if got is not None:
        return got
    from pydantic import ConfigDict, create_model
    from pydantic import Field as PydanticField
    from pydantic import field_validator as pyd_field_validator
    from pydantic import model_validator as pyd_model_validator

    names = cls._record_validation_names() if cls._record_validation_names else None
    hints = _annotations(cls, names)
    fields = {}
    for name, spec in cls._record_specs.items():
        options = dict(spec.constraints)
        if spec.default_factory is not None:
            options["default_factory"] = spec.default_factory
        elif spec.default is not _MISSING:
            options["default"] = spec.default
        fields[name] = (_translate(hints[name]), PydanticField(**options))
    checks = {}
    for name, check in cls._record_checks.items():
        if check.kind == "field":
            checks[name] = pyd_field_validator(*check.fields, mode=check.mode)(check.func)
        else:
            checks[name] = pyd_model_validator(mode=check.mode)(check.func)
    config = ConfigDict(frozen=True, extra="forbid", **cls.model_config)
    model = create_model(cls.__name__, __config__=config, __validators__=checks, __module__=cls.__module__,
                         __doc__=cls.__doc__, **fields)
    _MODELS[cls] = model
    _RECORDS[model] = cls
    return model


def _translate(tp):
    """An annotation with every record class replaced by its pydantic model."""
    if isinstance(tp, type):
        return pydantic_model(tp) if issubclass(tp, Record) else tp
    origin = typing.get_origin(tp)
    args = typing.get_args(tp)
    if origin is None or not args:
        return tp
    if origin is typing.Annotated:
        return typing.Annotated[(_translate(args[0]), *tp.__metadata__)]
    if origin is typing.Literal:
        return tp
    new = tuple(_translate(a) for a in args)
    if origin is typing.Union or type(tp).__name__ == "UnionType":
        return typing.Union[new]
    if origin is list:
        return list[new[0]]
    if origin is dict:
        return dict[new[0], new[1]]
    if origin is tuple:
        return tuple[new]
    raise TypeError(f"record annotation {tp!r} is not supported")


def _from_model(cls: type, obj) -> Record:
    """The record for a validated pydantic instance (nested ones too)."""
    given = obj.__dict__  # a pydantic instance keeps its field values here, in field order
    values = {name: _plain(given[name]) for name in cls._record_specs}
    return cls._record_make(values, set(obj.model_fields_set))


def _plain(value):
    kind = type(value)
    if kind is str or kind is float or kind is int or kind is bool or value is None:
        return value
    record = _RECORDS.get(kind)
    if record is not None:
        return _from_model(record, value)
    if isinstance(value, list):
        return [_plain(v) for v in value]
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, tuple):
        return tuple(_plain(v) for v in value)
    return value
