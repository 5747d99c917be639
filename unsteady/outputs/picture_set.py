"""Every picture of a run: the registry of :mod:`~unsteady.outputs.pictures` with the picture modules that add to it.

A picture kept in a module of its own registers itself with
``@pictures.picture(name)`` when imported; importing it here (and reading
``PICTURES`` and ``write_run_plots`` from here) keeps the import graph free
of cycles.
"""

from . import pictures_surface  # noqa: F401  (surface-pressure.png of thick sections)
from .pictures import PICTURES, write_run_plots

__all__ = ["PICTURES", "write_run_plots"]
