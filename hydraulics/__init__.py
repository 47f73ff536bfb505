"""PumpSketch hydraulic engine: pure functions over plain float64 SI numpy arrays.

Nothing in this package imports Qt, pyqtgraph or the ``app`` package; pint is used only in
:mod:`hydraulics.units` (parsing and display at the edges) and the project-file reader.
"""
