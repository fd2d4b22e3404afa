"""retime: substitution and datasheet-rule advisor for 555-class timers and one-shots.

The Python API (:mod:`advisor.api`) is reached lazily, so ``import advisor`` stays
light: ``advisor.check``, ``advisor.design``, ``advisor.swap``, ``advisor.alternates``
and ``advisor.review_bom``.
"""

__version__ = "0.1.0"

_API = ("check", "design", "swap", "alternates", "review_bom")


def __getattr__(name: str):
    if name in _API:
        from advisor import api

        return getattr(api, name)
    raise AttributeError(f"module 'advisor' has no attribute {name!r}")


def __dir__():
    return sorted(list(globals()) + list(_API))
