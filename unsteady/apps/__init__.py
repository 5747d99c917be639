"""The command line: one module per command (imported only when that command runs), sweeps, compare."""
