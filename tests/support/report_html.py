"""Read a report page with the standard library's html.parser, for the report tests."""

from __future__ import annotations

from dataclasses import dataclass, field
from html.parser import HTMLParser


@dataclass
class Node:
    tag: str
    attrs: dict
    text: str = ""
    parents: tuple[str, ...] = ()  # tags (with their class) from the root down


@dataclass
class Page:
    nodes: list[Node] = field(default_factory=list)
    svgs: int = 0
    svg_ids: list[str] = field(default_factory=list)
    tags: set = field(default_factory=set)

    def find(self, tag: str, cls: str | None = None) -> list[Node]:
        return [n for n in self.nodes if n.tag == tag and (cls is None or cls in n.attrs.get("class", "").split())]

    def with_attr(self, name: str) -> list[Node]:
        return [n for n in self.nodes if name in n.attrs]

    def section_text(self, section_id: str) -> str:
        return " ".join(n.text for n in self.nodes if f"section#{section_id}" in n.parents)


_VOID = {"meta", "br", "hr", "img", "input", "link", "path", "rect", "circle", "line", "polyline", "polygon", "ellipse", "use"}


class _Reader(HTMLParser):
    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.page = Page()
        self.stack: list[Node] = []

    def _path(self) -> tuple[str, ...]:
        return tuple(f"{n.tag}#{n.attrs['id']}" if "id" in n.attrs else n.tag for n in self.stack)

    def handle_starttag(self, tag, attrs):
        node = Node(tag, {k: (v or "") for k, v in attrs}, parents=self._path())
        self.page.nodes.append(node)
        self.page.tags.add(tag)
        if tag == "svg":
            self.page.svgs += 1
        if "id" in node.attrs and any(n.tag == "svg" for n in self.stack + [node]):
            self.page.svg_ids.append(node.attrs["id"])
        if tag not in _VOID:
            self.stack.append(node)

    def handle_startendtag(self, tag, attrs):
        self.handle_starttag(tag, attrs)
        if tag not in _VOID and self.stack and self.stack[-1].tag == tag:
            self.stack.pop()

    def handle_endtag(self, tag):
        for i in range(len(self.stack) - 1, -1, -1):
            if self.stack[i].tag == tag:
                del self.stack[i:]
                break

    def handle_data(self, data):
        for n in self.stack:
            n.text += data


def read_page(text: str) -> Page:
    r = _Reader()
    r.feed(text)
    r.close()
    return r.page
