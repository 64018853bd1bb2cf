"""`python -m planner` runs the benchplan command line."""
from planner.cli import main

main(prog_name="benchplan")
