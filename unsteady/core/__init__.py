"""Bottom layer: error types, the name registry, the caution texts, the version."""
