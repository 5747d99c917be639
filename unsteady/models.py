"""Registry of alternative run models, chosen by ``[run] model`` (the vortex model is the default)."""

from __future__ import annotations

from . import scenario

#: name -> fn(sc, observers=(), progress=False) -> Result
MODELS = {}


def register_model(name):
    """Decorator: register ``fn(sc, observers=(), progress=False) -> Result`` under ``name``.

    The name becomes an allowed value of ``[run] model``.
    """
    def deco(fn):
        MODELS[name] = fn
        if name not in scenario.RUN_MODELS:
            scenario.RUN_MODELS.append(name)
        return fn
    return deco


def get(name):
    """The run function registered as ``name``.

    Raises
    ------
    KeyError
        With the registered names, when ``name`` is not one of them.
    """
    try:
        return MODELS[name]
    except KeyError:
        raise KeyError(f"no run model {name!r}; registered: {', '.join(sorted(MODELS))}") from None


@register_model("linear")
def run_linear(sc, observers=(), progress=False):
    """Classical indicial-response model (Wagner, Kuessner, Theodorsen): see :mod:`unsteady.linear`."""
    from .linear import simulate_linear
    return simulate_linear(sc, observers=observers, progress=progress)
