"""Scenario input: loading, checks, sections, motion laws, gusts, atmosphere, the aircraft and sweep sections."""
