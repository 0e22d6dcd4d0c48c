"""Attach the commands that live in their own modules to the CLI groups."""

from __future__ import annotations


def register(main, calc) -> None:
    """Add command objects to ``main`` and ``calc`` (imports click-only modules)."""
    import importlib

    for module, attr, group in (
        ("calc_conductor", "ampacity_command", calc),
        ("calc_conductor", "size_command", calc),
        ("calc_vdrop", "voltage_drop_command", calc),
        ("calc_fault", "fault_command", calc),
        ("report", "report_command", main),
        ("report", "rerun_command", main),
        ("schedule", "schedule_command", main),
    ):
        try:
            mod = importlib.import_module(f"feedcheck.commands.{module}")
        except ModuleNotFoundError as exc:
            if exc.name != f"feedcheck.commands.{module}":
                raise
            continue
        group.add_command(getattr(mod, attr))
