"""The ``unsteady`` command line: run, check, and the commands other modules add.

Exit status: 0 success; 2 invalid input (one line per problem on stderr as
``error: <file>: <key>: <message>``, nothing written); 1 anything else.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from .errors import InputError
from .registry import import_optional
from .results import check_out_dir
from .scenario import ScenarioError, load_scenario

# Subcommands: name -> (add_arguments(parser), handler(args) -> exit status).
COMMANDS = {}


def command(name, help_):
    """Register a subcommand: decorate ``handler(args)``; ``handler.add_arguments(p)`` adds options."""
    def deco(fn):
        COMMANDS[name] = (help_, fn)
        return fn
    return deco


class UsageError(Exception):
    """Bad input on the command line that is not a scenario problem (exit 2)."""


def _load(args):
    sc = load_scenario(args.scenario, overrides=getattr(args, "set", None) or None)
    for line in sc.warnings:       # e.g. a gust beyond the attached-flow range
        print(line, file=sys.stderr)
    return sc


def _add_run(p):
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--out", metavar="DIR", help="run directory (default: output.dir of the scenario)")
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                   help="override a scenario key, e.g. --set airfoil.panels=80 (repeatable)")
    p.add_argument("--quiet", action="store_true", help="no progress bar or report")
    p.add_argument("--no-plots", action="store_true", help="skip the PNG pictures")


@command("run", "run a scenario and write its run directory")
def cmd_run(args):
    from .runner import simulate
    sc = _load(args)
    out = Path(args.out) if args.out else sc.out_dir()
    problem = check_out_dir(out)
    if problem:
        raise UsageError(problem)
    res = simulate(sc, progress=not args.quiet)
    path = res.save(out, plots=sc.data["output"].get("plots", True) and not args.no_plots)
    if res.error:
        print(f"unsteady: run stopped early: {res.error}; the {len(res.history['t'])} steps "
              f"computed so far are in {path}", file=sys.stderr)
        return 1
    if not args.quiet:
        s = res.summary
        print(f"{path}: {s['steps']} steps in {s['wall_time_s']:.2f} s; "
              f"cl {s.get('cl_min', float('nan')):.4f} .. {s.get('cl_max', float('nan')):.4f} "
              f"(max at t = {s.get('t_cl_max', float('nan')):.4g} s)"
              + (f"; load factor {s['n_min']:.3f} .. {s['n_max']:.3f}" if "n_max" in s else ""))
        if "n_max" in s:
            from .theory import GUST_CAUTION
            print(f"caution: {GUST_CAUTION}")
    return 0


cmd_run.add_arguments = _add_run


def _add_check(p):
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                   help="override a scenario key (repeatable)")


@command("check", "validate a scenario without running it")
def cmd_check(args):
    sc = _load(args)
    if "sweep" in sc.data:
        from .sweep import check_cases
        check_cases(sc)
    print(f"{args.scenario}: ok ({sc.steps} steps of {sc.dt:.4g} s, {sc.panels} elements, "
          f"{sc.data['run']['wake']} wake)")
    return 0


cmd_check.add_arguments = _add_check


def _load_plugins():
    # Importing these modules registers their subcommands.
    import_optional(__package__, ("animate", "sweep", "compare", "plots"))


class _Parser(argparse.ArgumentParser):
    """argparse with the project's one-line error format and exit status 2."""

    def error(self, message):
        self.exit(2, f"error: -: {self.prog}: {message} (see '{self.prog} --help')\n")


def build_parser():
    _load_plugins()
    parser = _Parser(
        prog="unsteady",
        description="Unsteady lift, drag and moment of an airfoil in pitch, plunge and gusts "
                    "(time-marching discrete-vortex model).")
    from . import __version__
    parser.add_argument("--version", action="version", version=f"unsteady {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    for name, (help_, fn) in COMMANDS.items():
        p = sub.add_parser(name, help=help_, description=help_)
        fn.add_arguments(p)
        p.set_defaults(handler=fn)
    return parser


def main(argv=None):
    parser = build_parser()
    args = parser.parse_args(argv)
    try:
        return args.handler(args)
    except ScenarioError as exc:
        for p in exc.problems:
            print(p.line(), file=sys.stderr)
        return 2
    except InputError as exc:
        print(f"error: {getattr(args, 'scenario', '-')}: {exc.key}: {exc.message}", file=sys.stderr)
        return 2
    except UsageError as exc:
        print(str(exc), file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print("unsteady: interrupted", file=sys.stderr)
        return 130
    except Exception as exc:  # anything else: one line, exit 1
        print(f"unsteady: {type(exc).__name__}: {exc}", file=sys.stderr)
        return 1


if __name__ == "__main__":
    sys.exit(main())
