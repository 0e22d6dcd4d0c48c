"""Write a job as one XLSX workbook (``feedcheck workbook``): a read-me sheet, then one
sheet per table of the job with its keys in row 1 and one element per row.

The cells spell the values as the job file writes them (:mod:`feedcheck.inputs.
workbook_cells`), so reading the workbook back (:mod:`feedcheck.inputs.workbook_file`)
gives the same data and the same results. Nothing here checks the job: the command
validates it first.
"""

from __future__ import annotations

import io
from pathlib import Path

from . import CAUTION
from .errors import ProblemList
from .inputs.workbook_cells import README_SHEET, SHEETS, CellRefused, cell_value

MAX_WIDTH = 60  # characters: a wider column is cut on screen, the cell keeps its text
# the order of the sheets (the job file's tables, the standby pair before the options)
SHEET_ORDER = (
    "project",
    "source",
    "transformer",
    "run",
    "panel",
    "motor",
    "generator",
    "transfer_switch",
    "options",
)

HOW_TO = (
    "How to fill it in",
    "Each sheet is one table of the job file; row 1 holds its keys (the same names as "
    "in the job file, see the README), each row below one element: a transformer, a "
    "run, a panel, a motor. project, source, options, generator and transfer_switch "
    "take one row.",
    "Write values as in the job file, units included: 85 ft, 300 kcmil Cu, 480 V delta, "
    "5.1 %, 30 kA. Numbers without a unit (x_r, sets, power_factor) are plain numbers; "
    "harmonic_neutral is TRUE or FALSE.",
    "An empty cell means the key is not given (its default applies). A lone apostrophe "
    "(') is an empty text; a text that starts like a formula (-2.5 %, =, +, @) is kept "
    "with one leading apostrophe, which is not part of the value. Type a signed tap with "
    "an apostrophe too ('+2.5 %): a spreadsheet would otherwise store the number 0.025 "
    "and drop the sign.",
    "Add a key: type it in row 1 of a free column. Add an element: fill the next row "
    "(no empty rows between elements). Add a table: a new sheet named after it "
    "(for example motor), with its keys in row 1.",
    'A panel\'s columns map is written as in the job file: {Ins = "insulation", Notes = "ignore"}.',
    "Panel schedules stay CSV or XLSX files in this workbook's folder, named by the "
    "panel's schedule key.",
    "Formulas are not computed: the result the spreadsheet stored is read. Merged cells "
    "and dates (except the project's date) are refused. This sheet is not read.",
    "Check it with: feedcheck check THIS.xlsx (every command that takes a job file takes "
    "the workbook).",
)


def job_workbook(data: dict, file: str = "") -> bytes:
    """The XLSX bytes of a job's data (as the TOML or workbook reader gives it).

    Raises
    ------
    InputError
        A table that is not one of the job's, a [[table]] written as [table], or a value
        no cell gives back unchanged (key path and value named; ``file`` names the job).
    """
    import openpyxl

    problems = ProblemList(file)
    tables = _tables(data, problems)
    wb = openpyxl.Workbook()
    _readme(wb.active)
    for kind in SHEET_ORDER:
        if kind in tables:
            _sheet(wb.create_sheet(kind), kind, tables[kind], problems)
    problems.raise_if_any()
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def write_job_workbook(data: dict, target: str | Path, file: str = "") -> None:
    """Write :func:`job_workbook` atomically to ``target`` (nothing written on error)."""
    from .io_atomic import write_bytes_atomic

    write_bytes_atomic(target, job_workbook(data, file))


def _tables(data: dict, problems: ProblemList) -> dict[str, list[dict]]:
    """Each table of the job as a list of elements (one for a single table)."""
    out = {}
    for kind, value in data.items():
        if kind not in SHEETS:
            problems.add(kind, kind, "a table of the job: " + ", ".join(SHEET_ORDER))
            continue
        many = SHEETS[kind][1]
        if many and isinstance(value, list) and all(isinstance(x, dict) for x in value):
            out[kind] = value
        elif not many and isinstance(value, dict):
            out[kind] = [value]
        else:
            shape = f"[[{kind}]] blocks" if many else f"a [{kind}] table"
            problems.add(kind, value, shape)
    return out


def _keys(kind: str, elements: list[dict]) -> list[str]:
    """The keys the elements use, in the order of the job's key list, others after."""
    used = dict.fromkeys(k for e in elements for k in e)
    return [k for k in SHEETS[kind][0] if k in used] + [k for k in used if k not in SHEETS[kind][0]]


def _sheet(ws, kind: str, elements: list[dict], problems: ProblemList) -> None:
    from openpyxl.styles import Font, PatternFill
    from openpyxl.utils import get_column_letter

    keys = _keys(kind, elements)
    widths = [len(k) for k in keys]
    try:
        ws.append([cell_value(kind, "", k)[0] for k in keys])
    except CellRefused as exc:
        problems.add(kind, exc.shown, exc.expected)
        return
    for cell in ws[1]:
        cell.font = Font(bold=True)
        cell.fill = PatternFill("solid", fgColor="DDE4EE")
    many = SHEETS[kind][1]
    for i, element in enumerate(elements, start=1):
        row = i + 1
        for j, key in enumerate(keys, start=1):
            if key not in element:
                continue
            path = f"{kind}[{i}].{key}" if many else f"{kind}.{key}"
            try:
                value, number_format = cell_value(kind, key, element[key])
            except CellRefused as exc:
                problems.add(path, exc.shown, exc.expected)
                continue
            cell = ws.cell(row=row, column=j, value=value)
            if number_format:
                cell.number_format = number_format
            widths[j - 1] = max(widths[j - 1], len(str(value)))
    ws.freeze_panes = "A2"
    for j, width in enumerate(widths, start=1):
        ws.column_dimensions[get_column_letter(j)].width = min(width + 2, MAX_WIDTH)


def _readme(ws) -> None:
    from openpyxl.styles import Alignment, Font

    ws.title = README_SHEET
    lines = [
        ("feedcheck job workbook", True),
        (CAUTION, True),
        ("", False),
        (HOW_TO[0], True),
        *((text, False) for text in HOW_TO[1:]),
        ("", False),
        ("Sheets and their keys", True),
        *((f"{kind}: " + ", ".join(SHEETS[kind][0]), False) for kind in SHEET_ORDER),
    ]
    for i, (text, bold) in enumerate(lines, start=1):
        cell = ws.cell(row=i, column=1, value=text)
        cell.alignment = Alignment(wrap_text=True, vertical="top")
        if bold:
            cell.font = Font(bold=True)
    ws.column_dimensions["A"].width = 110


def template_workbook() -> bytes:
    """The commented job template of ``feedcheck init`` as a workbook."""
    import tomllib

    from .template import TEMPLATE

    return job_workbook(tomllib.loads(TEMPLATE))
