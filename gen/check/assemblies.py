"""Check every ``assemblies:`` entry by its kind's module; add the parts it makes."""

from __future__ import annotations

from dataclasses import replace

from gen.assemblies import assembly_module
from gen.errors import ParamError
from gen.findings import ERROR, Finding
from gen.params.project import display_path
from gen.params.schema import Where


def check_assemblies(result) -> None:
    for entry in result.project.entries.get("assemblies", []):
        where = Where(entry.file, entry.label, entry.line, section="assembly")
        try:
            module = assembly_module(entry.values.get("kind"), where)
            asm, models = module.build(entry, where)
        except ParamError as exc:
            result.findings.append(Finding(ERROR, "parameter", exc.one_line(), entry.label, "",
                                           scope="assembly"))
            continue
        clash = [n for n in models if n in result.project.parts or n in result.models]
        if clash:
            result.findings.append(Finding(ERROR, "parameter", f"assembly '{entry.label}' makes a "
                                           f"part '{clash[0]}' whose name is already taken",
                                           entry.label, "", scope="assembly"))
            continue
        result.models.update(models)
        result.recipes.update({n: ("assembly", entry, n) for n in models})
        for m in models.values():
            result.findings += [replace(f, where=f.where or display_path(entry.file))
                                for f in m.findings]
        result.findings += asm.findings
        result.assemblies.append(asm)
