"""Every run picture: the registry of :mod:`unsteady.outputs.pictures` with the modules that add to it.

The picture modules import the house style from ``pictures``, so ``pictures``
cannot import them; commands and the run folder take ``PICTURES`` and
``write_run_plots`` from here.  A new picture module: one import line below.
"""

from __future__ import annotations

from . import pictures_loads  # noqa: F401  (registers turbulence-loads.png)
from . import pictures_surface  # noqa: F401  (registers surface-pressure.png of thick sections)
from .pictures import PICTURES, write_run_plots

__all__ = ["PICTURES", "write_run_plots"]
