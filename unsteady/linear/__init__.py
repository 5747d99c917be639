"""linear."""
