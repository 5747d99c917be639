"""unsteady: time-marching discrete-vortex model of an airfoil's unsteady aerodynamics."""

from .core.version import __version__  # noqa: F401
from .inputs.scenario import Scenario, ScenarioError, load_scenario  # noqa: F401
from .simulation.result import Result  # noqa: F401


def simulate(scenario, observers=(), *, progress=False):
    """Run a scenario (see :func:`unsteady.simulation.runner.simulate`)."""
    from .simulation.runner import simulate as _simulate
    return _simulate(scenario, observers, progress=progress)
