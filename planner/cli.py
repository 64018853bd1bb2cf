"""The `benchplan` command line: thin commands over the library, every error one clear line.

Exit codes: 0 done; 1 blocking findings when asked to fail on them; 2 bad input or usage;
3 internal error (traceback only with --debug).
"""
from __future__ import annotations

import functools
import json
import sys
import traceback
from pathlib import Path

import click

from planner import __version__
from planner.setup import SetupError, json_schema, load_setup
from planner.units import UnitError

EXIT_BLOCKING, EXIT_BAD_INPUT, EXIT_INTERNAL = 1, 2, 3


class UserInputError(click.ClickException):
    """Bad input that is not a setup-file problem (a point, a path, an option value)."""

    exit_code = EXIT_BAD_INPUT


def guarded(command):
    """Turn setup errors into exit 2 and unexpected errors into exit 3 without a traceback."""
    @functools.wraps(command)
    def wrapper(*args, **kwargs):
        debug = click.get_current_context().find_root().params.get("debug", False)
        try:
            return command(*args, **kwargs)
        except SetupError as error:
            click.echo(error.summary(), err=True)
            sys.exit(EXIT_BAD_INPUT)
        except UnitError as error:
            raise UserInputError(str(error)) from None
        except (click.ClickException, click.exceptions.Exit, click.Abort, SystemExit, KeyboardInterrupt):
            raise
        except BrokenPipeError:  # output piped into `head` and the like
            sys.stderr.close()
            sys.exit(0)
        except Exception as error:  # noqa: BLE001 - the last line of defence for users
            if debug:
                traceback.print_exc()
            click.echo(f"benchplan: internal error ({type(error).__name__}: {error}). "
                       "This is a bug; run again with --debug for the details and report them.", err=True)
            sys.exit(EXIT_INTERNAL)
    return wrapper


#: Magnets from which a setup's keep-out distances take long enough to say so first
#: (about 0.6 s for 30 magnets on a 2-core machine, benchmarks/zones.py; more when they are close).
MANY_MAGNETS = 20


def long_work_notice(setup) -> str | None:
    """A line for stderr before the figures of a setup with many magnets, else None."""
    count = len(getattr(setup, "magnets", None) or [])
    if count < MANY_MAGNETS:
        return None
    return (f"benchplan: working out the keep-out distances of {count} magnets; "
            "a setup this size takes about a second (0.6 s for 30 magnets on a 2-core machine)")


def announce_long_work(setup) -> None:
    """Print :func:`long_work_notice` on stderr, if any, so a long wait is not a silent one."""
    notice = long_work_notice(setup)
    if notice:
        click.echo(notice, err=True)


@click.group(context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="benchplan")
@click.option("--debug", is_flag=True, help="Show the full traceback of internal errors.")
def main(debug: bool) -> None:
    """Plan strong-magnet and induction demonstrations from one YAML setup file.

    Figures support, and never replace, the site's own risk assessment, local codes and
    its competent persons.
    """


setup_argument = click.argument("setup_file", metavar="SETUP", type=click.Path(dir_okay=False, path_type=Path))


@main.command()
@setup_argument
@guarded
def check(setup_file: Path) -> None:
    """Validate SETUP and summarise what was read."""
    from planner.summary import describe_setup

    setup = load_setup(setup_file)
    click.echo(describe_setup(setup))


@main.command()
@click.option("--json", "as_json", is_flag=True, help="Print the tables as JSON.")
@guarded
def grades(as_json: bool) -> None:
    """List magnet grades, conductors and steels with their sources."""
    from planner.summary import material_tables

    tables = material_tables()
    if as_json:
        click.echo(json.dumps(tables, indent=2))
        return
    for name, table in tables.items():
        click.echo(f"\n{name}")
        rows = table["rows"]
        headers = table["columns"]
        widths = [max(len(str(h)), *(len(str(r[i])) for r in rows)) for i, h in enumerate(headers)]
        click.echo("  " + "  ".join(str(h).ljust(w) for h, w in zip(headers, widths)))
        for row in rows:
            click.echo("  " + "  ".join(str(c).ljust(w) for c, w in zip(row, widths)))
        for key, text in table["sources"].items():
            click.echo(f"  [{key}] {text}")


@main.command()
@guarded
def schema() -> None:
    """Print the JSON Schema of the setup file (for editors)."""
    click.echo(json.dumps(json_schema(), indent=2))


@main.command()
@click.option("--out", type=click.Path(dir_okay=False, path_type=Path), help="Write here instead of printing.")
@click.option("--force", is_flag=True, help="Overwrite an existing file.")
@guarded
def new(out: Path | None, force: bool) -> None:
    """Write a commented starter setup file."""
    from importlib import resources

    text = resources.files("planner").joinpath("templates/starter.yaml").read_text(encoding="utf-8")
    if out is None:
        click.echo(text, nl=False)
        return
    if out.exists() and not force:
        raise UserInputError(f"{out} already exists; choose another name or add --force")
    out.write_text(text, encoding="utf-8")
    click.echo(f"wrote {out}; edit it, then run: benchplan check {out}")


def _register_commands() -> None:
    """Commands that live in their own modules, to keep this file a list of thin verbs."""
    from planner import cli_assess, cli_field, cli_report

    for module in (cli_field, cli_assess, cli_report):
        for command in module.COMMANDS:
            main.add_command(command)


_register_commands()


if __name__ == "__main__":  # pragma: no cover
    main()
