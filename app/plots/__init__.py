"""Plots of a solution: head against flow, efficiency and power, NPSH (pyqtgraph)."""
