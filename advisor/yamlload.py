"""The one YAML reader for catalog and rules files: safe, strict and bounded.

- Safe: PyYAML's safe constructor (plain data only; the C parser when libyaml is there).
- Strict: a key written twice in one mapping is refused with both lines (PyYAML would
  silently keep the second, so a pasted block could replace a published value).
- Bounded: the document's size once aliases are expanded is counted on the parsed
  node graph before any Python object is built, so a "billion laughs" file (a few
  hundred bytes of nested aliases that stand for 10^9 nodes) is refused at once, as
  is an alias that refers to itself. Files are read through
  :func:`advisor.files.read_regular` (regular files within a size limit only).
"""

from __future__ import annotations

from functools import lru_cache

# PyYAML is imported when a document is read, not with this module: a run answered from
# the start-up cache (advisor.cache) reads no YAML and does not pay for the import.

#: Most nodes a catalog or rules document may stand for with aliases expanded. The
#: largest shipped file has about 1 500; this leaves room for big user files.
MAX_NODES = 200_000


class YamlProblem(ValueError):
    """A located problem reading a YAML document (``line`` is 1-based or None)."""

    def __init__(self, message: str, line: int | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.line = line

    @property
    def where(self) -> str:
        return f"line {self.line}" if self.line else ""


@lru_cache(maxsize=1)
def strict_loader() -> type:
    """The safe loader class that refuses duplicate keys (built on first use)."""
    import yaml
    from yaml.constructor import ConstructorError
    from yaml.nodes import MappingNode

    try:  # the C parser is ~10x faster; the constructor stays PyYAML's safe one either way
        base = yaml.CSafeLoader
    except AttributeError:  # pragma: no cover
        base = yaml.SafeLoader

    class StrictLoader(base):
        """Safe loader that refuses duplicate keys."""

        def construct_mapping(self, node, deep=False):
            if isinstance(node, MappingNode):
                seen: dict[object, int] = {}
                for key_node, _value in node.value:
                    if key_node.tag == "tag:yaml.org,2002:merge":
                        continue
                    key = self.construct_object(key_node, deep=True)
                    try:
                        first = seen.get(key)
                    except TypeError:
                        continue  # unhashable key: the base constructor reports it
                    line = key_node.start_mark.line + 1
                    if first is not None:
                        raise ConstructorError(
                            None, None,
                            f"key {_short(key)} appears twice in one mapping (lines {first} and {line}); "
                            "keep one", key_node.start_mark,
                        )
                    seen[key] = line
            return super().construct_mapping(node, deep=deep)

    return StrictLoader


def __getattr__(name: str):  # ``advisor.yamlload.StrictLoader`` as before, built on first use
    if name == "StrictLoader":
        return strict_loader()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def _short(value: object) -> str:
    text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def expanded_size(root, limit: int = MAX_NODES) -> int:
    """Node count of the document with every alias expanded (refuses cycles and ``limit``)."""
    from yaml.nodes import MappingNode, SequenceNode

    sizes: dict[int, int] = {}
    active: set[int] = set()

    def size(node) -> int:
        key = id(node)
        got = sizes.get(key)
        if got is not None:
            return got
        if key in active:
            raise YamlProblem("an alias refers to the node that contains it (a recursive document)",
                              node.start_mark.line + 1)
        active.add(key)
        total = 1
        if isinstance(node, SequenceNode):
            for child in node.value:
                total += size(child)
                if total > limit:
                    break
        elif isinstance(node, MappingNode):
            for k, v in node.value:
                total += size(k) + size(v)
                if total > limit:
                    break
        active.discard(key)
        if total > limit:
            raise YamlProblem(f"the document stands for more than {limit} values once its aliases "
                              "are expanded (an alias bomb?)", node.start_mark.line + 1)
        sizes[key] = total
        return total

    return size(root)


def parse_yaml(text: str) -> object:
    """The document in ``text`` as plain data; raises :class:`YamlProblem`."""
    import yaml

    loader = strict_loader()(text)
    try:
        node = loader.get_single_node()
        if node is None:
            return None
        expanded_size(node)
        return loader.construct_document(node)
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        problem = getattr(exc, "problem", None) or str(exc)
        raise YamlProblem(f"not valid YAML: {_cut(problem)}", mark.line + 1 if mark else None) from None
    except RecursionError:
        raise YamlProblem("not valid YAML: nested too deeply") from None
    finally:
        loader.dispose()


def _cut(text: str, n: int = 200) -> str:
    return text if len(text) <= n else text[: n - 3] + "..."


def load_yaml_file(path, kind: str) -> object:
    """Read ``path`` (a regular file within ``kind``'s size limit) and parse it.

    Raises :class:`advisor.files.FileRefused` for the file itself, :class:`YamlProblem`
    for its content (UTF-8 is required).
    """
    from advisor.files import read_regular

    raw = read_regular(path, kind)
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise YamlProblem(f"not UTF-8 text (byte {exc.start})") from None
    return parse_yaml(text)
