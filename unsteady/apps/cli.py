"""The ``unsteady`` command: parses the command line and hands over to one command module.

Each command is a module of :mod:`unsteady.apps` with ``add_arguments(parser)`` and
``main(args) -> exit status``; only the module of the command given is imported,
so ``unsteady --help`` and ``unsteady check`` start without the numerics,
pictures or films.

Exit status: 0 success; 2 invalid input (one line per problem on stderr as
``error: <file>: <key>: <message>``, nothing written); 1 anything else;
130 interrupted (Ctrl-C), 143 terminated (SIGTERM): one line, no traceback, no
temporary left behind.  Only the standard library is imported before
:func:`main` has set the signal handlers, so an interrupt at any point of
start-up is handled like one during the run.
"""

from __future__ import annotations

import signal
import sys

from ..core.errors import Interrupted

#: command -> (module under unsteady.apps, one-line help)
COMMANDS = {
    "run": ("run", "run a scenario and write its run directory"),
    "check": ("check", "validate a scenario without running it"),
    "sweep": ("sweep", "run the cases of a scenario's [sweep] in parallel (resumable)"),
    "animate": ("animate", "turn a run directory into a film (MP4 or GIF)"),
    "pictures": ("pictures", "redraw the PNG pictures of a run directory"),
    "compare": ("compare", "overlay the histories and loops of several runs and tabulate their lag metrics"),
    "report": ("report", "write one self-contained HTML page (pictures, film) of a run or a sweep folder"),
}


def _parser_class():
    import argparse

    class _Parser(argparse.ArgumentParser):
        """argparse with the project's one-line error format and exit status 2."""

        def error(self, message):
            self.exit(2, f"error: -: {self.prog}: {message} (see '{self.prog} --help')\n")

    return _Parser


def _chosen(argv):
    """The command named in ``argv`` (the first word that is not an option), or None."""
    for a in argv:
        if not a.startswith("-"):
            return a if a in COMMANDS else None
    return None


def build_parser(argv=None):
    """The parser; only the chosen command's module is imported (all of them when ``argv`` is None)."""
    import importlib
    from ..core.version import __version__
    _Parser = _parser_class()
    parser = _Parser(
        prog="unsteady",
        description="Unsteady lift, drag and moment of an airfoil in pitch, plunge and gusts "
                    "(time-marching discrete-vortex model).")
    parser.add_argument("--version", action="version", version=f"unsteady {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    chosen = _chosen(argv) if argv is not None else None
    for name, (module, help_) in COMMANDS.items():
        p = sub.add_parser(name, help=help_, description=help_)
        if argv is None or name == chosen:
            mod = importlib.import_module(f"{__package__}.{module}")
            mod.add_arguments(p)
            p.set_defaults(handler=mod.main)
    return parser


#: Signals received by the program (see :func:`main`): an interrupt that a library turned into
#: another exception (numpy's import makes an ImportError of it) is still an interrupt.
_RECEIVED = []


#: Seconds between repeats of an interrupt that has not yet unwound the program (see _on_signal).
_REPEAT_S = 0.05


def _on_signal(signum, frame):
    """Turn Ctrl-C and SIGTERM into an exception, and repeat it until the program unwinds.

    An exception raised while a C library calls back into Python (numba's
    cache notification while it compiles a kernel, say) is printed as
    "Exception ignored" and dropped, and the program would run on as if no
    signal had come; so the first signal also starts a timer that raises the
    same interrupt again every :data:`_REPEAT_S` s until :func:`_settle` stops it.
    """
    if not _RECEIVED and hasattr(signal, "setitimer"):
        signal.signal(signal.SIGALRM, _again)
        signal.setitimer(signal.ITIMER_REAL, _REPEAT_S, _REPEAT_S)
    _RECEIVED.append(signum)
    _again(signum, frame)


def _quiet_unraisable(unraisable):
    """Drop the "Exception ignored" report of an interrupt raised inside a C callback (the timer
    of :func:`_on_signal` repeats it); every other unraisable exception is reported as usual."""
    if isinstance(unraisable.exc_value, (KeyboardInterrupt, Interrupted)):
        return
    sys.__unraisablehook__(unraisable)


def _again(signum, frame):
    if signal.SIGTERM in _RECEIVED:
        raise Interrupted()
    raise KeyboardInterrupt()


def _received():
    """The interrupt to report when a signal arrived, else None."""
    if not _RECEIVED:
        return None
    return Interrupted() if signal.SIGTERM in _RECEIVED else KeyboardInterrupt()


def _settle():
    """Ignore further Ctrl-C and SIGTERM while the process winds down (no second traceback)."""
    if hasattr(signal, "setitimer"):
        signal.setitimer(signal.ITIMER_REAL, 0)
    for sig in (signal.SIGINT, signal.SIGTERM, getattr(signal, "SIGALRM", signal.SIGTERM)):
        try:
            signal.signal(sig, signal.SIG_IGN)
        except (ValueError, OSError):
            pass


def main(argv=None):
    """Run the command line; returns the exit status.

    With ``argv`` None (the ``unsteady`` program, ``python -m unsteady``) the
    signal handlers are set first: SIGTERM unwinds like Ctrl-C, and once the
    command has finished or been stopped, further signals are ignored.  Called
    with a list (tests, other programs) the caller's handlers are left alone.
    """
    program = argv is None
    try:
        if program:
            sys.unraisablehook = _quiet_unraisable
            signal.signal(signal.SIGTERM, _on_signal)
            if signal.getsignal(signal.SIGINT) is not signal.SIG_IGN:
                signal.signal(signal.SIGINT, _on_signal)
        argv = sys.argv[1:] if argv is None else list(argv)
        args = build_parser(argv).parse_args(argv)
        status = _dispatch(args)
    except KeyboardInterrupt as exc:
        if program:
            _settle()
        status = _interrupted(exc)
    except Exception:
        if _received() is None:
            raise
        _settle()
        status = _interrupted(_received())
    if program:
        _settle()
        if status in (130, 143):
            # Done: temporaries are gone and the line is out.  Leave now: an interrupt that hit
            # code run by an extension during an import can leave the interpreter set to kill
            # itself with SIGINT at exit (status -2 instead of 130).
            import os
            for stream in (sys.stdout, sys.stderr):
                try:
                    stream.flush()
                except (OSError, ValueError):
                    pass
            os._exit(status)
    return status


def _interrupted(exc):
    if isinstance(exc, Interrupted):
        print("unsteady: terminated", file=sys.stderr)
        return 143
    print("unsteady: interrupted", file=sys.stderr)
    return 130


def _dispatch(args):
    from ..core.errors import InputError, OutputError, UsageError
    from ..inputs.checks import ScenarioError
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
    except OutputError as exc:
        print(str(exc), file=sys.stderr)
        return 1
    except OSError as exc:   # an output that failed although it was checked: one line
        where = f"{exc.filename}: " if exc.filename else ""
        print(f"unsteady: {where}{exc.strerror or exc}; files already there were left as they were",
              file=sys.stderr)
        return 1
    except Exception as exc:  # anything else: one line, exit 1
        if _received() is not None:         # an interrupt a library turned into something else
            raise _received() from None
        text = " ".join(str(exc).split())
        print(f"unsteady: {type(exc).__name__}: {text[:400]}{'...' if len(text) > 400 else ''}",
              file=sys.stderr)
        return 1


if __name__ == "__main__":
    sys.exit(main())
