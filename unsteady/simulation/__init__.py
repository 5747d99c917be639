"""The model registry, the one runner that wires every run, the time-loop observers, the Result."""
