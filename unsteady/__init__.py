"""unsteady: time-marching discrete-vortex model of an airfoil's unsteady aerodynamics.

The names below are imported on first use, so that ``import unsteady`` (and the
``unsteady`` program, which sets its signal handlers before anything heavy is
loaded) starts with the standard library only.
"""

from .core.version import __version__  # noqa: F401

#: public name -> module that holds it
_LAZY = {"Scenario": "inputs.scenario", "ScenarioError": "inputs.scenario",
         "load_scenario": "inputs.scenario", "Result": "simulation.result"}

__all__ = ["__version__", "simulate", *_LAZY]


def __getattr__(name):
    if name in _LAZY:
        import importlib
        value = getattr(importlib.import_module(f"{__name__}.{_LAZY[name]}"), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__():
    return sorted(set(globals()) | set(_LAZY))


def simulate(scenario, observers=(), *, progress=False):
    """Run a scenario (see :func:`unsteady.simulation.runner.simulate`)."""
    from .simulation.runner import simulate as _simulate
    return _simulate(scenario, observers, progress=progress)
