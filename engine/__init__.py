"""electrosieve's thermodynamics engine: exact E–pH stability domains and screening (pure numpy, no I/O after loading)."""
