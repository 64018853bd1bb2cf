"""Pure physics: numpy functions on SI floats and arrays. No I/O, no setup types.

References: see each module's docstring and ../shared/reference/physics.md.
"""
