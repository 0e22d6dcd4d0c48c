"""One table row a figure is computed from, with the row's confidence (see
:meth:`feedcheck.rulebook.RuleBook.row_use`): what a finding names when the row is not
confirmed in a published copy."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from .calc.sizes import parse_size
from .tables import is_confirmed


@dataclass(frozen=True)
class RowUse:
    """One table row a figure is computed from, with the row's confidence.

    ``row`` names the row as a reader finds it (its key values or rule id); ``cite`` is
    the published table it reproduces (the table's optional ``# cite:`` header)."""

    table: str
    row: str
    confidence: str
    cite: str = ""

    @property
    def confirmed(self) -> bool:
        return is_confirmed(self.confidence)

    def note(self) -> str:
        """The note a finding computed from this row carries when it is unconfirmed.

        >>> RowUse("ampacity_raceway", "1250 kcmil cu", "from memory — verify",
        ...        "NFPA 70 Table 310.16").note()
        'uses an unconfirmed value from NFPA 70 Table 310.16 (ampacity_raceway) row 1250 kcmil cu'
        """
        where = f"{self.cite} ({self.table})" if self.cite else self.table
        return f"uses an unconfirmed value from {where} row {self.row}"


def canon_cell(column: str, value: Any) -> str:
    """A cell as text for matching rows; a ``size`` cell in its canonical spelling."""
    text = str(value).strip()
    if column == "size":
        try:
            return parse_size(text).name
        except ValueError:
            return text
    return text
