"""PumpSketch desktop application and command line (Qt lives only in this package)."""
