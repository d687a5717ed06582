"""The reference commands: ``pdvoid materials`` (the built-in host materials and gases, with the status and
source of every value) and ``pdvoid cite`` (the references a run relies on)."""

from __future__ import annotations

import argparse
import json
from typing import Any

from pdvoid.faces.cli.output import SAFETY, json_safe

__all__ = ["register", "material_rows", "citation_entries", "bibtex_like"]

#: the SI unit of a gas constant → (display unit, SI value per display unit) for the table
_GAS_DISPLAY = {"V/m": ("kV/mm", 1e6)}
_STATUS_WORDS = ("confirmed = checked against public text; derived = derived here from stated equations and "
                 "checked numerically; from memory = recalled, not confirmed; common practice = an unsourced "
                 "trade value; tuned = chosen to match a behaviour")


def material_rows(kind: str = "all") -> list[dict[str, Any]]:
    """One row per value of the built-in host materials and gases: name, quantity, value, unit, status, source.

    Parameters
    ----------
    kind : str
        ``"all"``, ``"materials"`` or ``"gases"`` [-].

    Returns
    -------
    list of dict
        Rows with keys kind, name, description, quantity, value, unit, status, source (values in the unit
        given: kV/mm for strengths, the parameter file's SI unit for gas constants) [-].
    """
    from pdvoid.inputs.materials import get_gas, get_material, list_gases, list_materials

    rows: list[dict[str, Any]] = []
    if kind in ("all", "materials"):
        for name in list_materials():
            m = get_material(name)
            rows.append({"kind": "material", "name": name, "description": m.description,
                         "quantity": "relative permittivity", "value": m.permittivity, "unit": "-",
                         "range": list(m.permittivity_range) if m.permittivity_range else None,
                         "status": m.status, "source": m.source})
            prov = m.dielectric_strength_provenance
            if m.dielectric_strength is not None and prov is not None:
                rows.append({"kind": "material", "name": name, "description": m.description,
                             "quantity": "dielectric strength (short time)", "value": m.dielectric_strength / 1e6,
                             "unit": "kV/mm", "range": None, "status": prov.status, "source": prov.source})
    if kind in ("all", "gases"):
        for name in list_gases():
            g = get_gas(name)
            for quantity, prov in g.provenance.items():
                value = getattr(g, quantity, None)
                if value is None:
                    continue
                unit, factor = _GAS_DISPLAY.get(prov.unit, (prov.unit if prov.unit != "1" else "-", 1.0))
                spread = [s / factor for s in prov.spread] if prov.spread else None
                rows.append({"kind": "gas", "name": name, "description": g.description,
                             "quantity": quantity.replace("_", " "), "value": float(value) / factor, "unit": unit,
                             "range": spread, "status": prov.status, "source": prov.source})
    return rows


def _cmd_materials(ns: argparse.Namespace) -> int:
    rows = material_rows(ns.kind)
    if ns.json:
        doc = {"rows": rows, "statuses": _STATUS_WORDS, "safety": SAFETY}
        print(json.dumps(json_safe(doc), indent=2, allow_nan=False))
        return 0
    last = None
    for r in rows:
        if (r["kind"], r["name"]) != last:
            last = (r["kind"], r["name"])
            print(f"\n{r['name']} ({r['kind']}): {r['description']}")
        rng = f" (range {r['range'][0]:.4g}-{r['range'][1]:.4g})" if r["range"] else ""
        print(f"  {r['quantity']:<34s} {r['value']:>11.6g} {r['unit']:<10s} {r['status']:<15s}{rng}")
        print(f"      source: {r['source']}")
    print(f"\nstatus: {_STATUS_WORDS}")
    print("These are typical values, not data of a particular product; permittivity and strength vary with "
          "frequency, temperature, filler, moisture and thickness.")
    print(SAFETY)
    return 0


def citation_entries(scenario_file: str | None) -> list[dict[str, str]]:
    """The references a simulation of ``scenario_file`` records (the keys of its Result), or the whole
    bibliography when it is None.

    Parameters
    ----------
    scenario_file : str or None
        A scenario TOML file, e.g. ``"demo.toml"`` [-].

    Returns
    -------
    list of dict
        ``{"key", "citation", "status"}`` in order of first use [-].
    """
    from pdvoid.core.references import REFERENCES, get_reference

    if scenario_file is None:
        keys: list[str] = list(REFERENCES)
    else:
        from pdvoid.inputs.scenario import Scenario
        from pdvoid.models import kernel_arguments

        keys = list(dict.fromkeys(kernel_arguments(Scenario.from_file(scenario_file)).references))
    return [{"key": k, "citation": get_reference(k).citation, "status": get_reference(k).status} for k in keys]


def bibtex_like(entries: list[dict[str, str]]) -> str:
    """The entries as BibTeX-like ``@misc`` records: the whole citation in ``note`` (pdvoid keeps citations as
    text, not split into author, title and venue) and the status in ``pdvoid_status``.

    Parameters
    ----------
    entries : list of dict
        From :func:`citation_entries` [-].

    Returns
    -------
    str
        The records, separated by blank lines [-].
    """
    def esc(text: str) -> str:
        return text.replace("\\", "\\\\").replace("{", "\\{").replace("}", "\\}")

    return "\n\n".join(f"@misc{{{e['key']},\n  note = {{{esc(e['citation'])}}},\n"
                       f"  pdvoid_status = {{{e['status']}}}\n}}" for e in entries)


def _cmd_cite(ns: argparse.Namespace) -> int:
    entries = citation_entries(ns.scenario)
    if ns.json:
        print(json.dumps({"scenario": ns.scenario, "references": entries, "statuses": _STATUS_WORDS}, indent=2))
    elif ns.format == "bibtex":
        print(bibtex_like(entries))
    else:
        if ns.scenario:
            print(f"{len(entries)} references a simulation of {ns.scenario} relies on (status in brackets):")
        else:
            print(f"the whole bibliography of pdvoid, {len(entries)} references (status in brackets):")
        for e in entries:
            print(f"[{e['key']}] {e['citation']} ({e['status']})")
        print(f"status: {_STATUS_WORDS}")
    return 0


def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """Add the ``materials`` and ``cite`` commands to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).
    """
    m = sub.add_parser("materials", help="table of the built-in host materials and gases: value, status, source",
                       description="Every value of the built-in host materials (relative permittivity, short-time "
                       "dielectric strength) and void gases (the constants of the inception criteria) with its "
                       "status (confirmed, derived, from memory, common practice, tuned) and its source.",
                       epilog="example: pdvoid materials --kind gases --json")
    m.add_argument("--kind", choices=("all", "materials", "gases"), default="all",
                   help="which table: all, materials (host dielectrics) or gases (default all)")
    m.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    m.set_defaults(func=_cmd_materials)
    c = sub.add_parser("cite", help="the references a scenario's run relies on (or the whole bibliography)",
                       description="The full citations a simulation of SCENARIO.toml records (the references of "
                       "its result), each with its status; without a scenario, the whole bibliography.",
                       epilog="example: pdvoid cite demo.toml --format bibtex")
    c.add_argument("scenario", nargs="?", default=None,
                   help="scenario TOML file, e.g. demo.toml (default: none, the whole bibliography)")
    c.add_argument("--format", choices=("plain", "bibtex"), default="plain",
                   help="plain (one citation a line) or bibtex (BibTeX-like @misc records; the citation in note) "
                   "(default plain)")
    c.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    c.set_defaults(func=_cmd_cite)
