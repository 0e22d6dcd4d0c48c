"""Defaults filled when a job is read, so nothing downstream sees ``None`` for them."""

from __future__ import annotations

from ..tables import load_table


def typical_x_r(rating_va: float) -> tuple[float, str]:
    """Typical transformer X/R by rating from tables/transformer_xr.csv.

    The row is the nearest rating at or below ``rating_va`` (the first row below the
    smallest rating). Returns the X/R and the row's label (``"75 kVA row"``).
    """
    t = load_table("transformer_xr").data
    kva = rating_va / 1000.0
    below = t[t["rating_kva"] <= kva + 1e-9]
    row = below.iloc[-1] if not below.empty else t.iloc[0]
    return float(row["x_r"]), f"{row['rating_kva']:g} kVA row"
