"""Safe YAML reading with line numbers, duplicate-key refusal and size, depth and alias limits.

The file is composed into a node graph by PyYAML's SafeLoader and converted by hand, so that
every mapping key keeps its line, duplicate keys and unknown tags are refused, nesting depth is
bounded (a deeply nested file is refused instead of exhausting the stack) and expanding aliases
is budgeted (a "billion laughs" file is refused instead of filling memory).

Numbers: besides YAML 1.1 floats (which need a dot, ``1.0e+3``) the plain exponent form people
write (``1e3``, ``-2E-4``) is read as a number. A number beyond the float range (a 400-digit
whole number, ``1e400``) is refused as too large, naming its line and key.
"""

from __future__ import annotations

import os
import re
import stat
import sys
from dataclasses import dataclass

import yaml

from gen.errors import ParamError
from gen.params.yaml_words import plain_words

MAX_FILE_BYTES = 1 << 20      # 1 MiB
MAX_NODES = 100_000           # expanded nodes per file
MAX_DEPTH = 64                # nested lists/mappings per file (a parameter file needs < 10)
#: decimal digits of the largest whole number read (floats end near 1.8e308)
MAX_INT_DIGITS = 309

#: tags a parameter file may carry (implicit or written as ``!!str`` …); anything else is refused
_STD = "tag:yaml.org,2002:"
ALLOWED_TAGS = {_STD + t for t in ("map", "seq", "str", "int", "float", "bool", "null")}
_EXPONENT = re.compile(r"^[-+]?[0-9][0-9_]*(?:\.[0-9_]*)?[eE][-+]?[0-9]+$")


class InputError(ParamError):
    """The input cannot be read at all (exit code 2): missing file, bad YAML, size limits."""


class _Loader(yaml.SafeLoader):
    """SafeLoader with a nesting-depth bound and plain-exponent floats."""

    def __init__(self, stream):
        super().__init__(stream)
        self._depth = 0

    def compose_node(self, parent, index):
        self._depth += 1
        try:
            if self._depth > MAX_DEPTH:
                mark = self.peek_event().start_mark
                raise _TooDeep(mark.line + 1)
            return super().compose_node(parent, index)
        finally:
            self._depth -= 1


_Loader.add_implicit_resolver(_STD + "float", _EXPONENT, list("-+0123456789"))


class _TooDeep(Exception):
    def __init__(self, line):
        super().__init__(line)
        self.line = line


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
    """Read a parameter file: a regular file of at most MAX_FILE_BYTES UTF-8 bytes."""
    try:
        st = os.stat(path)
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror}", file=path) from None
    if not stat.S_ISREG(st.st_mode):
        what = ("a named pipe (FIFO)" if stat.S_ISFIFO(st.st_mode) else
                "a device" if stat.S_ISCHR(st.st_mode) or stat.S_ISBLK(st.st_mode) else
                "a socket" if stat.S_ISSOCK(st.st_mode) else
                "a folder" if stat.S_ISDIR(st.st_mode) else "not a plain file")
        raise InputError(f"is {what}, not a regular file; parameter files must be regular files",
                         file=path)
    if st.st_size > MAX_FILE_BYTES:
        raise InputError(f"file is {st.st_size} bytes, larger than the {MAX_FILE_BYTES} byte "
                         "limit", file=path)
    try:
        # O_NONBLOCK: should the file be swapped for a FIFO after the check, open does not hang
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        with os.fdopen(fd, "rb") as fh:
            if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
                raise InputError("is not a regular file; parameter files must be regular files",
                                 file=path)
            raw = fh.read(MAX_FILE_BYTES + 1)   # bounded: the file may have grown
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror}", file=path) from None
    if len(raw) > MAX_FILE_BYTES:
        raise InputError(f"file is larger than the {MAX_FILE_BYTES} byte limit", file=path)
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[:exc.start].count(b"\n") + 1
        raise InputError("file is not UTF-8 text", file=path, line=line) from None
    return load_text(text, path)


def load_text(text: str, path: str = "<input>") -> Doc:
    loader = _Loader(text)
    try:
        node = loader.get_single_node()
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line = mark.line + 1 if mark else None
        raise InputError(plain_words(exc.context, exc.problem), file=path, line=line) from None
    except _TooDeep as exc:
        raise InputError(f"lists and mappings are nested more than {MAX_DEPTH} deep",
                         file=path, line=exc.line) from None
    except yaml.YAMLError as exc:
        raise InputError(f"not valid YAML ({exc})", file=path) from None
    except RecursionError:  # a safety net: the depth bound should stop this first
        raise InputError("lists and mappings are nested too deep", file=path) from None
    finally:
        loader.dispose()
    lines: dict = {}
    budget = [MAX_NODES]
    data = _convert(node, (), lines, budget, path, loader) if node is not None else {}
    return Doc(path=path, data=data, lines=lines)


def _origin(where: tuple, path: str, line: int) -> dict:
    """ParamError fields naming the section entry and key a value sits under."""
    names = [str(k) for k in where]
    if len(names) >= 4 and names[0] == "trains" and names[2] == "parts":
        return dict(file=path, line=line, section="part", part=names[3],
                    key=".".join(names[4:]) or None)
    if len(names) >= 2 and names[0] in ("parts", "trains", "meshes", "drives", "assemblies",
                                        "fits"):
        section = {"parts": "part", "meshes": "mesh", "drives": "drive", "trains": "train",
                   "assemblies": "assembly", "fits": "fit"}[names[0]]
        label = names[1] if not isinstance(where[1], int) else f"{names[0]}[{names[1]}]"
        return dict(file=path, line=line, section=section, part=label,
                    key=".".join(names[2:]) or None)
    return dict(file=path, line=line, key=".".join(names) or None)


def _check_tag(node, where, path):
    tag = node.tag
    if tag in ALLOWED_TAGS or (isinstance(node, yaml.ScalarNode) and tag == _STD + "timestamp"):
        return
    shown = tag.replace(_STD, "!!")
    raise InputError(f"the tag '{shown}' is not understood; parameter files use no tags "
                     "(remove it)", **_origin(where, path, node.start_mark.line + 1))


def _convert(node, where, lines, budget, path, loader):
    budget[0] -= 1
    if budget[0] < 0:
        raise InputError(f"document expands to more than {MAX_NODES} nodes (alias expansion?)",
                         file=path, line=node.start_mark.line + 1)
    _check_tag(node, where, path)
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
            _check_tag(knode, where, path)
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
    line = node.start_mark.line + 1
    if node.tag == _STD + "int":
        digits = sum(c.isdigit() for c in node.value)
        if digits > MAX_INT_DIGITS:
            raise InputError(f"number too large: a whole number of {digits} digits; numbers "
                             "must stay below 1e308", **_origin(where, path, line))
    try:
        value = loader.construct_object(node, deep=True)
    except (yaml.YAMLError, ValueError, OverflowError) as exc:
        raise InputError(f"cannot read value '{node.value[:40]}' ({exc})",
                         **_origin(where, path, line)) from None
    if isinstance(value, float) and value in (float("inf"), float("-inf")) \
            and "inf" not in node.value.lower():
        raise InputError(f"number too large: '{node.value[:40]}' is beyond the float range "
                         f"(about 1.8e308)", **_origin(where, path, line))
    if isinstance(value, int) and not isinstance(value, bool) and \
            abs(value) > sys.float_info.max:
        raise InputError("number too large: whole numbers must stay below 1e308",
                         **_origin(where, path, line))
    return value
