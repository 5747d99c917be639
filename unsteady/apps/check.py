"""``unsteady check``: validate a scenario (and every case of its sweep) without running it."""

from __future__ import annotations

from .common import add_set, load


def add_arguments(p):
    p.add_argument("scenario", help="scenario file (TOML)")
    add_set(p, "override a scenario key (repeatable)")


def main(args):
    sc = load(args)
    if "sweep" in sc.data:
        from ..inputs.sweep_cases import check_cases
        check_cases(sc)
    from ..simulation.runner import trim_of
    trimmed = trim_of(sc)                    # pitch freedom: refused here when no trim exists
    print(f"{args.scenario}: ok ({sc.steps} steps of {sc.dt:.4g} s, {sc.elements} elements, "
          f"{sc.data['run']['wake']} wake)")
    if trimmed:
        print(f"trim: {trimmed}")
    return 0
