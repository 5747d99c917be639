"""The discrete-vortex model: Biot-Savart kernels, bodies, shedding sites, the bordered solve, loads, the time march."""
