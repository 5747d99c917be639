"""apps."""
