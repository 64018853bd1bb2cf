"""benchplan: plan strong-magnet and induction demonstrations offline."""
__version__ = "0.1.0"
