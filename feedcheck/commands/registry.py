"""Attach the commands that live in their own modules to the CLI groups.

Each module imports only click and light modules at its top (heavy imports happen
inside the command bodies), so registering them keeps `feedcheck calc …` fast.
"""

from __future__ import annotations


def register(main, calc) -> None:
    """Add the command objects to ``main`` and ``calc``."""
    from . import (
        calc_conductor,
        calc_fault,
        calc_transformer,
        calc_vdrop,
        compare,
        edit,
        extract,
        labels,
        report,
        schedule,
        workbook,
    )

    for group, command in (
        (calc, calc_transformer.rated_current_command),
        (calc, calc_transformer.regulation_command),
        (calc, calc_conductor.ampacity_command),
        (calc, calc_conductor.size_command),
        (calc, calc_vdrop.voltage_drop_command),
        (calc, calc_fault.fault_command),
        (main, report.report_command),
        (main, report.rerun_command),
        (main, schedule.schedule_command),
        (main, extract.extract_command),
        (main, compare.compare_command),
        (main, labels.labels_command),
        (main, workbook.workbook_command),
        (main, edit.edit_command),
    ):
        group.add_command(command)
