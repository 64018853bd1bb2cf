"""Figures for a whole setup: each module turns setup parts into physics-body calls."""
