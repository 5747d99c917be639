"""unsteady: time-marching discrete-vortex model of an airfoil's unsteady aerodynamics."""

__version__ = "0.1.0"
