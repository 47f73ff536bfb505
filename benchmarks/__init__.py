"""PumpSketch benchmarks (``make bench``) and the timing harnesses they use."""
