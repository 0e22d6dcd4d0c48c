"""Input problems: one message per problem, all collected before giving up.

A user mistake never becomes a traceback. Parsers collect :class:`Problem`
records and raise one :class:`InputError` carrying all of them; the CLI prints
each on its own line and exits with code 2 without writing anything.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True)
class Problem:
    """One thing wrong with one input.

    Attributes
    ----------
    file : str
        File the problem is in ("" for a command-line option).
    where : str
        Key path (``run[2].length``), ``row 7, column 'length [ft]'`` or an option name.
    value : str
        The offending value as the user wrote it ("" when missing).
    expected : str
        What would have been accepted.
    line : int | None
        Line number in the file, where known.
    """

    file: str
    where: str
    value: str
    expected: str
    line: int | None = None

    def __str__(self) -> str:
        loc = self.file or "input"
        if self.line is not None:
            loc += f":{self.line}"
        shown = repr(self.value) if self.value != "" else "(missing)"
        where = f" {self.where}" if self.where else ""
        return f"{loc}:{where} got {shown}; expected {self.expected}"


@dataclass
class InputError(Exception):
    """One or more problems with the user's input (exit code 2)."""

    problems: list[Problem] = field(default_factory=list)

    def __post_init__(self) -> None:
        super().__init__(self.__str__())

    def __str__(self) -> str:
        return "\n".join(str(p) for p in self.problems)


class ProblemList:
    """Collects problems while parsing; raises them together at the end."""

    def __init__(self, file: str = "") -> None:
        self.file = file
        self.items: list[Problem] = []

    def add(
        self,
        where: str,
        value: object,
        expected: str,
        line: int | None = None,
        file: str | None = None,
    ) -> None:
        self.items.append(
            Problem(self.file if file is None else file, where, _show(value), expected, line)
        )

    def extend(self, problems: list[Problem]) -> None:
        self.items.extend(problems)

    def __bool__(self) -> bool:
        return bool(self.items)

    def raise_if_any(self) -> None:
        if self.items:
            raise InputError(list(self.items))


def _show(value: object) -> str:
    if value is None:
        return ""
    text = str(value)
    return text if len(text) <= 80 else text[:77] + "..."
