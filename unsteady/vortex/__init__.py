"""vortex."""
