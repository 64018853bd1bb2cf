"""benchplan: plan strong-magnet and induction demonstrations offline.

The public API (fixed names): :func:`load_setup`, :func:`parse_setup`, :class:`SetupError`,
:func:`field`, :func:`force`, :func:`keep_out_distance`, :func:`assess`.
"""
__version__ = "0.1.0"

from planner.assess import assess  # noqa: E402
from planner.queries import field, force, keep_out_distance  # noqa: E402
from planner.setup import Setup, SetupError, load_setup, parse_setup  # noqa: E402

__all__ = ["__version__", "Setup", "SetupError", "load_setup", "parse_setup", "field", "force",
           "keep_out_distance", "assess"]
