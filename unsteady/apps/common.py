"""Small pieces the command modules share: loading a scenario with its warnings, common options."""

from __future__ import annotations

import sys


def load(args):
    """The scenario of ``args.scenario`` with ``--set`` overrides; its warnings go to stderr."""
    from ..inputs.scenario import load_scenario
    sc = load_scenario(args.scenario, overrides=getattr(args, "set", None) or None)
    for line in sc.warnings:       # e.g. a gust beyond the attached-flow range
        print(line, file=sys.stderr)
    return sc


def add_set(p, what="override a scenario key, e.g. --set airfoil.elements=80 (repeatable)"):
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE", help=what)
