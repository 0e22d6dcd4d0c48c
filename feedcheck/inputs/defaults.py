"""Defaults filled when a job is read, so nothing downstream sees ``None`` for them."""

from __future__ import annotations

from ..tables import load_table


def typical_x_r(rating_va: float) -> tuple[float, str]:
    """Typical transformer X/R by rating from tables/transformer_xr.csv.

    The row is the rating itself when listed, else the next rating above it (the higher
    X/R: conservative for the maximum fault and the peak current; the last row above the
    largest rating). Returns the X/R and the row's label (``"75 kVA row"``).
    """
    t = load_table("transformer_xr").data
    kva = rating_va / 1000.0
    above = t[t["rating_kva"] >= kva - 1e-9]
    row = above.iloc[0] if not above.empty else t.iloc[-1]
    return float(row["x_r"]), xr_row_label(float(row["rating_kva"]), kva)


def xr_row_label(row_kva: float, rating_kva: float) -> str:
    """Label of the typical-X/R row used for a rating."""
    if abs(row_kva - rating_kva) <= 1e-9:
        return f"{row_kva:g} kVA row"
    return (
        f"{row_kva:g} kVA row, the next listed rating (the higher X/R: conservative for the "
        "maximum fault and peak)"
    )
