"""Say when the 60 °C termination rule governs a conductor (issue 13 item 7).

NFPA 70-2023 110.14(C)(1)(a): terminations of circuits rated 100 A or less, or marked
for 14 through 1 AWG conductors, are taken at 60 °C unless the equipment is listed and
marked for 75 °C. When the job leaves a run's ``termination`` out and this rule picks the
60 °C column below the conductor's insulation column, the run's ampacity is cut by it:
the finding and the report's assumptions say so, naming the key that changes it.
"""

from __future__ import annotations

from ..model import Run
from .context import Context


def termination_note(ctx: Context, run: Run, termination_c: float, cap_a: float) -> str:
    """Text for the ampacity findings of ``run`` when the 60 °C rule governs, else ""."""
    if run.termination_c is not None or termination_c != 60.0 or run.insulation_c <= 60.0:
        return ""
    text = (
        f"{run.id}: terminations taken at 60 °C by 110.14(C)(1)(a) (circuit of 100 A or "
        f"less, or 14–1 AWG), so {run.size.name} is held to its 60 °C ampacity "
        f"({cap_a:.0f} A); where the equipment at both ends is listed and marked for "
        f'75 °C, set termination = "75 degC" on [[run]] {run.id}'
    )
    ctx.assume(text)
    return "; the 60 °C termination rule governs (110.14(C)(1)(a)): " + (
        'termination = "75 degC" on the run changes it where the equipment is rated so'
    )
