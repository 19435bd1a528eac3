"""Safe YAML reading with line numbers, duplicate-key refusal and alias-bomb limits.

The file is composed into a node graph by PyYAML's SafeLoader and converted by hand, so that
every mapping key keeps its line, duplicate keys are refused, and expanding aliases is
budgeted (a "billion laughs" file is refused instead of filling memory).
"""

from __future__ import annotations

import os
from dataclasses import dataclass

import yaml

from gen.errors import ParamError

MAX_FILE_BYTES = 1 << 20      # 1 MiB
MAX_NODES = 100_000           # expanded nodes per file


class InputError(ParamError):
    """The input cannot be read at all (exit code 2): missing file, bad YAML, size limits."""


@dataclass
class Doc:
    """A loaded document: plain data plus the line of every mapping key (1-based)."""

    path: str
    data: object
    lines: dict  # tuple(path of keys/indices) -> line

    def line(self, *keys) -> int | None:
        keys = tuple(keys)
        while keys:
            if keys in self.lines:
                return self.lines[keys]
            keys = keys[:-1]
        return None


def load_file(path: str) -> Doc:
    try:
        size = os.path.getsize(path)
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror}", file=path) from None
    if size > MAX_FILE_BYTES:
        raise InputError(f"file is {size} bytes, larger than the {MAX_FILE_BYTES} byte limit",
                         file=path)
    try:
        with open(path, "rb") as fh:
            text = fh.read().decode("utf-8")
    except UnicodeDecodeError:
        raise InputError("file is not UTF-8 text", file=path) from None
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror}", file=path) from None
    return load_text(text, path)


def load_text(text: str, path: str = "<input>") -> Doc:
    loader = yaml.SafeLoader(text)
    try:
        node = loader.get_single_node()
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line = mark.line + 1 if mark else None
        what = exc.problem or exc.context or "syntax error"
        raise InputError(f"YAML syntax error: {what}", file=path, line=line) from None
    except yaml.YAMLError as exc:
        raise InputError(f"YAML error: {exc}", file=path) from None
    finally:
        loader.dispose()
    lines: dict = {}
    budget = [MAX_NODES]
    data = _convert(node, (), lines, budget, path, loader) if node is not None else {}
    return Doc(path=path, data=data, lines=lines)


def _convert(node, where, lines, budget, path, loader):
    budget[0] -= 1
    if budget[0] < 0:
        raise InputError(f"document expands to more than {MAX_NODES} nodes (alias expansion?)",
                         file=path, line=node.start_mark.line + 1)
    if isinstance(node, yaml.MappingNode):
        out = {}
        for knode, vnode in node.value:
            if not isinstance(knode, yaml.ScalarNode):
                raise InputError("mapping keys must be plain words", file=path,
                                 line=knode.start_mark.line + 1)
            key = knode.value
            if knode.tag == "tag:yaml.org,2002:merge" or key == "<<":
                raise InputError("merge keys ('<<') are not supported; repeat the values or "
                                 "use a train", file=path, line=knode.start_mark.line + 1)
            if key in out:
                raise InputError(f"duplicate key '{key}'", file=path,
                                 line=knode.start_mark.line + 1)
            lines[where + (key,)] = knode.start_mark.line + 1
            out[key] = _convert(vnode, where + (key,), lines, budget, path, loader)
        return out
    if isinstance(node, yaml.SequenceNode):
        out = []
        for i, item in enumerate(node.value):
            lines[where + (i,)] = item.start_mark.line + 1
            out.append(_convert(item, where + (i,), lines, budget, path, loader))
        return out
    try:
        return loader.construct_object(node, deep=True)
    except yaml.YAMLError as exc:
        raise InputError(f"cannot read value: {exc}", file=path,
                         line=node.start_mark.line + 1) from None
