"""The result of a run: history arrays, summary, snapshots (plain data)."""

from __future__ import annotations


class Result:
    """What a run produced.

    Attributes
    ----------
    history : dict of str -> ndarray
        One entry per CSV column, one value per time step.
    summary : dict
        The headline numbers (as ``summary.json``).
    snapshots : dict of str -> ndarray
        Wake snapshots (see :class:`unsteady.simulation.observers.SnapshotRecorder`) and
        ``dcp`` (pressure-jump coefficient per step and element).
    scenario : Scenario or None
    error : str or None
        Set when the run stopped early (non-finite state); the history then
        holds the steps computed before.
    """

    def __init__(self, history, summary, snapshots=None, scenario=None, error=None):
        self.history = history
        self.summary = summary
        self.snapshots = snapshots or {}
        self.scenario = scenario
        self.error = error

    # ------------------------------------------------------------------
    def save(self, out_dir, plots=True):
        """Write the run directory atomically (see :func:`unsteady.outputs.rundir.save_run`).

        Returns the Path written.
        """
        from ..outputs.rundir import save_run   # the one late-bound edge (see DEVELOPERS.md)
        return save_run(self, out_dir, plots=plots)

    @classmethod
    def load(cls, run_dir):
        """Read a run directory (see :func:`unsteady.outputs.rundir.load_run`)."""
        from ..outputs.rundir import load_run
        return load_run(run_dir)
