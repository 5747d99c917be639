"""What a history means: the summary's headline numbers and the lift-lag metrics."""
