"""unsteady: time-marching discrete-vortex model of an airfoil's unsteady aerodynamics."""

__version__ = "0.1.0"

from .scenario import Scenario, ScenarioError, load_scenario  # noqa: E402,F401
from .results import Result  # noqa: E402,F401


def simulate(scenario, observers=(), *, progress=False):
    """Run a scenario (see :func:`unsteady.runner.simulate`)."""
    from .runner import simulate as _simulate
    return _simulate(scenario, observers, progress=progress)
