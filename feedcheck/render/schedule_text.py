"""The terminal summary of ``feedcheck schedule`` (no computation here): per file its
totals, its failing and warning circuits, its panel findings; then the count."""

from __future__ import annotations

from functools import lru_cache

from .. import CAUTION
from .display import fixed, status_word


def _kva(v) -> str:
    return fixed(v, 1, 1e-3)


@lru_cache(maxsize=64)  # a folder's files share a few systems: each text parsed once
def _phase_letters(system_text: str) -> str:
    """``ABC`` for a three-phase system, ``AB`` for a single-phase (split or two-wire) one."""
    from ..units import parse_voltage_system

    try:
        return "ABC" if parse_voltage_system(system_text).phases == 3 else "AB"
    except Exception:  # an unparsable text: show all three, as the totals hold them
        return "ABC"


def _phases_text(t: dict, letters: str) -> str:
    vals = "/".join(_kva(t[f"phase_{x.lower()}_va"]) for x in letters)
    return f"phases {'/'.join(letters)} {vals} kVA"


def _spaces_text(t: dict) -> str:
    sp, sc = int(t.get("spares", 0) or 0), int(t.get("spaces", 0) or 0)
    return f"; {sp} spare, {sc} space" if sp or sc else ""


def _totals_line(r, circuits: int, fails: int, warns: int) -> str:
    t = r.totals
    if "panels" in t:
        return (
            f"{r.path.name}: {t['panels']} panels, {circuits} circuits, {fails} fail, "
            f"{warns} warn; connected {_kva(t['connected_va'])} kVA, demand "
            f"{_kva(t['demand_va'])} kVA, worst imbalance "
            f"{fixed(t['worst_imbalance_pct'], 1)} %{_spaces_text(t)}  ({r.system})"
        )
    return (
        f"{r.path.name}  panel {t['panel']}  {r.system}: {circuits} circuits, {fails} fail, "
        f"{warns} warn; connected {_kva(t['connected_va'])} kVA, demand "
        f"{_kva(t['demand_va'])} kVA (design {fixed(t['design_current_a'], 1)} A); "
        f"{_phases_text(t, _phase_letters(r.system))}, imbalance "
        f"{fixed(t['imbalance_pct'], 1)} %{_spaces_text(t)}"
    )


def render_schedule_summary(results, show_all: bool, shown_circuits: int = 20) -> str:
    """Summary of checked schedules for a terminal; without ``show_all`` at most
    ``shown_circuits`` failing or warning circuits per file are listed."""
    lines = []
    n_fail = n_warn = n_circ = 0
    for r in results:
        # a few columns, not every file's frame cut out
        st = r.column("circuits", "status").tolist()
        fails, warns = st.count("fail"), st.count("warn")
        n_fail, n_warn, n_circ = n_fail + fails, n_warn + warns, n_circ + len(st)
        lines.append(_totals_line(r, len(st), fails, warns))
        for note in getattr(r, "notices", []):
            word = "WARN" if note.startswith(("warning:", "column")) else "note"
            lines.append(f"  {word:4}  {note.removeprefix('warning: ')}")
        bad = [i for i, v in enumerate(st) if v != "ok"]
        shown = bad if show_all else bad[:shown_circuits]
        if shown:  # a column read only when a circuit of it is listed
            panel, circuit, reason = (
                r.column("circuits", k).tolist() for k in ("panel", "circuit", "reason")
            )
        for i in shown:
            word = status_word(st[i], loud=True)
            lines.append(f"  {word:4}  {panel[i]}/{circuit[i]}  {reason[i]}")
        if len(bad) > len(shown):
            lines.append(f"  … {len(bad) - len(shown)} more (--all lists them, --out saves all)")
        loud = [f for f in r.findings if f.status in ("fail", "warn")]
        panel_ids = set(r.column("panels", "panel").tolist()) if loud else set()
        for f in loud:
            if f.subject in panel_ids:
                word = status_word(f.status, loud=True)
                lines.append(f"  {word:4}  {f.subject}  {f.check}: {f.note}")
    lines.append(f"\n{len(results)} file(s), {n_circ} circuits: {n_fail} fail, {n_warn} warn")
    lines.append(CAUTION)
    return "\n".join(lines) + "\n"
