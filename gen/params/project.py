"""Read parameter files into raw part, mesh and drive declarations.

Structure only: which parts exist (from ``parts:`` and from ``trains:``, with the train's
shared tooth-system values merged in), their kinds, names and source lines, and the declared
pairs. Per-kind keys are checked by the part kinds (:mod:`gen.parts`), which sit above this
layer.

File layout (units mm and degrees)::

    parts:   {<name>: {kind: spur_gear, module: 2, teeth: 20, ...}}
    trains:  {<name>: {module: 1.5, pressure_angle: 20, parts: {<name>: {...}}}}
    meshes:  [{parts: [a, b], center_distance: 43.1}]
"""

from __future__ import annotations

import os
import re
from dataclasses import dataclass, field

from gen.errors import ParamError
from gen.params.schema import suggest
from gen.params.yamlio import Doc, InputError, load_file

#: tooth-system keys a train gives once for all its parts
TRAIN_SHARED = ("module", "pressure_angle", "helix_angle", "profile", "module_basis")
#: top-level sections and who reads them
SECTIONS = ("parts", "trains", "series", "meshes", "assemblies", "drives", "drivetrains",
            "fits", "rotors")
#: sections whose entries are mappings, given as a list or by name
ENTRY_SECTIONS = ("meshes", "assemblies", "drives", "drivetrains", "rotors")
NAME_RE = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_.-]{0,63}$")
#: names of pitchline's own output files
OWN_OUTPUTS = {"manifest", "report", "plate"}
#: device names Windows reserves whatever the extension ("con.gear" is as bad as "con")
#: (Microsoft, "Naming Files, Paths, and Namespaces" — from memory)
DEVICE_NAMES = {"con", "prn", "aux", "nul"} | {f"{d}{i}" for d in ("com", "lpt") for i in range(10)}
RESERVED = OWN_OUTPUTS | DEVICE_NAMES


@dataclass(frozen=True)
class RawPart:
    name: str
    kind: str
    values: dict          # as written, train values merged in (degrees, mm)
    file: str
    train: str | None
    lines: dict           # key -> line
    inherited: tuple = () # keys whose value the train gives

    def origin(self, key: str | None) -> str | None:
        """Where an inherited value came from ("train 't'"), None for the part's own."""
        root = (key or "").split(".")[0]
        return f"train '{self.train}'" if root in self.inherited else None

    def line(self, key: str | None = None) -> int | None:
        if key is not None:
            root = key.split(".")[0]
            if root in self.lines:
                return self.lines[root]
        return self.lines.get(None)


@dataclass(frozen=True)
class RawEntry:
    """A ``meshes``, ``assemblies`` or ``drives`` entry: a mapping plus where it came from."""

    section: str
    index: int | str
    values: dict
    file: str
    lines: dict

    def line(self, key: str | None = None) -> int | None:
        return self.lines.get(key, self.lines.get(None))

    @property
    def label(self) -> str:
        return f"{self.section}[{self.index}]" if isinstance(self.index, int) else str(self.index)


@dataclass
class RawProject:
    files: list = field(default_factory=list)
    parts: dict = field(default_factory=dict)          # name -> RawPart
    trains: dict = field(default_factory=dict)         # name -> list of part names
    entries: dict = field(default_factory=dict)        # section -> [RawEntry]
    stems: dict = field(default_factory=dict)          # lower-case output name -> (name, where)


def display_path(path: str) -> str:
    """A path as messages show it: relative to the working folder when it lies inside it."""
    rel = os.path.relpath(path)
    return path if rel.startswith("..") else rel


def find_files(paths) -> list[str]:
    """YAML files named or found (non-recursively sorted, recursively) in folders."""
    out = []
    for p in paths:
        if os.path.isdir(p):
            found = []
            for root, dirs, files in os.walk(p):
                dirs.sort()
                found += [os.path.join(root, f) for f in sorted(files)
                          if f.endswith((".yaml", ".yml"))]
            if not found:
                raise InputError("folder holds no .yaml files", file=p)
            out += found
        elif os.path.exists(p):
            out.append(p)
        else:
            raise InputError("no such file or folder", file=p)
    return out


def name_problem(name) -> str | None:
    """Why ``name`` cannot name a part (its output files), or None when it can.

    Names become file names, so they must be portable: letters, digits, '_', '-', '.', a
    letter or digit first, no dot last, at most 64 characters, and no Windows device name
    (CON, PRN, AUX, NUL, COM0–9, LPT0–9) before the first dot.
    """
    if not isinstance(name, str) or not NAME_RE.match(name):
        return ("use letters, digits, '_', '-', '.'; start with a letter or digit; at most "
                "64 characters")
    if name.endswith("."):
        return "a name may not end with a dot (Windows drops it from file names)"
    stem = name.split(".")[0].lower()
    if stem in DEVICE_NAMES:
        return f"'{name.split('.')[0]}' is a device name on Windows, unusable in file names"
    if name.lower() in OWN_OUTPUTS:
        return "the name of one of pitchline's own output files"
    return None


def check_name(name, doc: Doc, keys, what="part") -> str:
    problem = name_problem(name)
    if problem:
        raise ParamError(f"{what} name {name!r} is not allowed: {problem}", file=doc.path,
                         line=doc.line(*keys))
    return name


def project_from_mapping(data: dict, name: str = "<python>") -> RawProject:
    """A project from a mapping laid out like a parameter file (the Python API's input)."""
    from gen.params.yamlio import Doc

    proj = RawProject()
    proj.files.append(name)
    _read_doc(Doc(path=name, data=data, lines={}), proj)
    return proj


def _check_case(proj: "RawProject", name: str, doc: Doc, keys, what: str) -> None:
    """Refuse a name whose output files would be those of an earlier part or assembly.

    Output files are named after parts and assemblies; names equal but for letter case are
    one file on Windows and macOS.
    """
    other = proj.stems.get(name.lower())
    if other is not None:
        same = "differs from" if other[0] != name else "is also"
        tail = " only in letter case" if other[0] != name else ""
        raise ParamError(f"{what} name '{name}' {same} {other[2]} '{other[0]}' ({other[1]})"
                         f"{tail}; their output files would collide", file=doc.path,
                         line=doc.line(*keys))
    proj.stems[name.lower()] = (name, f"{display_path(doc.path)}:{doc.line(*keys)}", what)


def load_project(paths) -> RawProject:
    proj = RawProject()
    for path in find_files(paths):
        doc = load_file(path)
        proj.files.append(path)
        _read_doc(doc, proj)
    return proj


def _mapping(value, doc: Doc, keys, what: str) -> dict:
    if not isinstance(value, dict):
        raise ParamError(f"{what} must be a mapping", file=doc.path, line=doc.line(*keys),
                         value=value if not isinstance(value, (list, dict)) else None)
    return value


def _lines_for(doc: Doc, keys, mapping: dict) -> dict:
    lines = {None: doc.line(*keys)}
    for k in mapping:
        lines[k] = doc.line(*keys, k)
    return lines


def _add_part(proj: RawProject, doc: Doc, name, body, keys, train=None, shared=None):
    name = check_name(name, doc, keys)
    body = _mapping(body, doc, keys, f"part '{name}'")
    if name in proj.parts:
        other = proj.parts[name]
        raise ParamError(f"duplicate part name '{name}' (also in {other.file}"
                         f"{':' + str(other.line()) if other.line() else ''})",
                         file=doc.path, line=doc.line(*keys), part=name)
    kind = body.get("kind")
    if kind is None:
        raise ParamError("is required", file=doc.path, line=doc.line(*keys), part=name, key="kind")
    if not isinstance(kind, str):
        raise ParamError("must be text", file=doc.path, line=doc.line(*keys, "kind"), part=name,
                         key="kind", value=kind)
    values = {k: v for k, v in body.items() if k != "kind"}
    lines = _lines_for(doc, keys, body)
    inherited = []
    if shared:
        for k, v in shared.items():
            if k in values and _same(values[k], v):
                inherited.append(k)   # a pasted part repeating its train's value
                continue
            if k in values:
                raise ParamError(f"is set by train '{train}' for all its parts; remove it here "
                                 "or move the part out of the train", file=doc.path,
                                 line=lines.get(k), part=name, key=k, value=values[k])
            values[k] = v
            lines[k] = doc.line("trains", train, k)
            inherited.append(k)
    _check_case(proj, name, doc, keys, "part")
    proj.parts[name] = RawPart(name=name, kind=kind, values=values, file=doc.path, train=train,
                               lines=lines, inherited=tuple(inherited))
    if train:
        proj.trains[train].append(name)


def _same(a, b) -> bool:
    """Equal as written: numbers by value (2 == 2.0), text ignoring case."""
    if isinstance(a, bool) or isinstance(b, bool):
        return a is b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        return float(a) == float(b)
    if isinstance(a, str) and isinstance(b, str):
        return a.lower() == b.lower()
    return a == b


def _read_doc(doc: Doc, proj: RawProject):
    data = doc.data
    if data is None or data == {}:
        raise InputError("file is empty", file=doc.path)
    if not isinstance(data, dict):
        raise InputError("top level must be a mapping with 'parts', 'trains', 'meshes', ...",
                         file=doc.path, line=1)
    for key in data:
        if key not in SECTIONS:
            raise ParamError(f"unknown section '{key}'{suggest(str(key), SECTIONS)}",
                             file=doc.path, line=doc.line(key), allowed=", ".join(SECTIONS))
    for name, body in _mapping(data.get("parts") or {}, doc, ("parts",), "'parts'").items():
        _add_part(proj, doc, name, body, ("parts", name))
    for sname, sbody in _mapping(data.get("series") or {}, doc, ("series",), "'series'").items():
        from gen.params.series import expand

        check_name(sname, doc, ("series", sname), what="series")
        for name, body in expand(sname, sbody, doc.path,
                                 lambda key: doc.line("series", sname, *(key.split(".")
                                                                         if key else ()))):
            _add_part(proj, doc, name, body, ("series", sname))
    for tname, tbody in _mapping(data.get("trains") or {}, doc, ("trains",), "'trains'").items():
        check_name(tname, doc, ("trains", tname), what="train")
        tbody = _mapping(tbody, doc, ("trains", tname), f"train '{tname}'")
        if tname in proj.trains:
            raise ParamError(f"duplicate train name '{tname}'", file=doc.path,
                             line=doc.line("trains", tname))
        proj.trains[tname] = []
        for k in tbody:
            if k not in TRAIN_SHARED and k != "parts":
                raise ParamError(f"unknown train key '{k}'{suggest(str(k), TRAIN_SHARED + ('parts',))}",
                                 file=doc.path, line=doc.line("trains", tname, k),
                                 allowed=", ".join(TRAIN_SHARED + ("parts",)))
        shared = {k: v for k, v in tbody.items() if k != "parts"}
        parts = _mapping(tbody.get("parts") or {}, doc, ("trains", tname, "parts"),
                         f"train '{tname}' parts")
        if not parts:
            raise ParamError(f"train '{tname}' has no parts", file=doc.path,
                             line=doc.line("trains", tname))
        for name, body in parts.items():
            _add_part(proj, doc, name, body, ("trains", tname, "parts", name), tname, shared)
    for section in ENTRY_SECTIONS:
        if section not in data or data[section] is None:
            continue
        value = data[section]
        if section == "assemblies" and isinstance(value, list):
            raise ParamError("'assemblies' must be a mapping of names, e.g. "
                             "'assemblies: {wrist: {kind: bevel_differential, ...}}': each "
                             "assembly's name names its files", file=doc.path,
                             line=doc.line(section))
        items = (list(enumerate(value)) if isinstance(value, list) else
                 list(_mapping(value, doc, (section,), f"'{section}'").items()))
        for idx, entry in items:
            if isinstance(idx, str):
                what = {"meshes": "mesh", "assemblies": "assembly"}.get(section, section[:-1])
                check_name(idx, doc, (section, idx), what=what)
                if section == "assemblies":
                    _check_case(proj, idx, doc, (section, idx), what)
            entry = _mapping(entry, doc, (section, idx), f"{section} entry {idx}")
            proj.entries.setdefault(section, []).append(
                RawEntry(section=section, index=idx, values=entry, file=doc.path,
                         lines=_lines_for(doc, (section, idx), entry)))
    if "fits" in data:
        value = _mapping(data["fits"], doc, ("fits",), "'fits'")
        for name, body in value.items():
            proj.entries.setdefault("fits", []).append(
                RawEntry(section="fits", index=name, values=_mapping(body, doc, ("fits", name), f"fit '{name}'"),
                         file=doc.path, lines=_lines_for(doc, ("fits", name), body)))
