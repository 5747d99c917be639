"""Error types of the library; the command line turns them into messages and exit codes."""


class InputError(ValueError):
    """A bad value of a scenario key (``key``: dotted path; ``message``: what is allowed)."""

    def __init__(self, key: str, message: str):
        super().__init__(f"{key}: {message}"); self.key = key; self.message = message


class UsageError(Exception):
    """Bad input that is not a scenario value: a folder, a file, an option (exit status 2).

    ``str()`` is the whole line the user sees, ``error: <file>: <key>: <what is wrong>``.
    """


class OutputError(Exception):
    """An output that could not be written although it was checked (a full disk, say): exit status 1.

    ``str()`` is the whole line the user sees; nothing half-written is left behind.
    """


class RunStopped(RuntimeError):
    """A motion stopped the march (its state ran away): the rows so far are kept and the run ends
    with ``Result.error`` set, like a diverged solver (``unsteady run`` exits 1)."""


class Interrupted(KeyboardInterrupt):
    """The process was asked to stop (SIGTERM); unwinds like Ctrl-C so that temporaries are removed."""
