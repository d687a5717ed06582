"""Every option of every command explains itself: help text, an example or the choices, and the default."""

from __future__ import annotations

import argparse
import re

import pytest

from pdvoid.faces.cli import build_parser


def _commands() -> dict[str, argparse.ArgumentParser]:
    for action in build_parser()._actions:
        if isinstance(action, argparse._SubParsersAction):
            return dict(action.choices)
    raise AssertionError("no sub-commands")


def _options():
    out = []
    for name, sub in _commands().items():
        for a in sub._actions:
            if isinstance(a, (argparse._HelpAction, argparse._VersionAction)):
                continue
            label = a.option_strings[0] if a.option_strings else a.dest
            out.append(pytest.param(name, a, id=f"{name} {label}"))
    return out


OPTIONS = _options()
_DEFAULT = re.compile(r"default[: ]+[^\s)]")  # "default 72", "default: off", never a bare "(default)"


def test_the_walk_finds_every_command_and_the_new_ones():
    names = set(_commands())
    assert {"demo", "simulate", "pattern", "inception", "margin", "fit", "measure", "report", "sweep", "plot",
            "materials", "cite"} <= names
    assert len(OPTIONS) > 80  # the walk sees the options, not an empty list


@pytest.mark.parametrize(("command", "action"), OPTIONS)
def test_every_option_has_help_an_example_or_its_choices_and_its_default(command, action):
    text = action.help
    assert text and text is not argparse.SUPPRESS, "no help text"
    if action.nargs == 0:  # a flag: what it does and what happens without it
        assert _DEFAULT.search(text), f"flag help states no default: {text!r}"
        return
    if action.choices:
        missing = [c for c in action.choices if str(c) not in text]
        assert not missing, f"help does not name the choices {missing}: {text!r}"
    else:
        assert "e.g." in text, f"help has no example: {text!r}"
    default = action.default
    if default not in (None, argparse.SUPPRESS, []) and not action.required:
        assert _DEFAULT.search(text), f"help does not state the default {default!r}: {text!r}"
        if isinstance(default, (int, str)) and not isinstance(default, bool):
            assert str(default) in text, f"help states another default than {default!r}: {text!r}"


@pytest.mark.parametrize("command", ["simulate", "sweep", "fit", "inception"])
def test_every_long_command_can_be_quiet(command):
    flags = {s for a in _commands()[command]._actions for s in a.option_strings}
    assert "--quiet" in flags
