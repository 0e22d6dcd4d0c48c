"""The 430.24 step above the panels on a node's calculation sheet (a panel feeding motor
panels, a transformer): the one largest-motor adder kept, the others taken off
(:func:`feedcheck.checks.motor_loads.one_adder_per_node`). No import of the other check
modules, so the load and panel checks can call it without an import circle."""

from __future__ import annotations


def node_adder_step(ctx, node: str, sheet) -> None:
    """430.24 above the panels on a node's sheet: the one 25 % kept (the largest motor
    below the node) and the other panels' 25 % not counted again."""
    found = ctx.node_motor_adders.get(node)
    if found is None:
        return
    k = found.kept
    after = ctx.loads[node].va

    def name(a):
        return f"{a.motor or 'schedule motor'} on {a.panel_id}"

    sheet.step(
        "Load with motors below: the largest motor's adder only (430.24)",
        "own + everything fed − the adder of every motor panel's largest motor but the "
        "largest one below",
        f"{after + found.dropped_va:,.0f} − "
        + " − ".join(f"{d.va:,.0f} ({name(d)})" for d in found.dropped)
        + f"; kept {k.va:,.0f} of the {k.motor_va:,.0f} VA motor ({name(k)})",
        round(after),
        "VA",
        "motor-feeder-largest",
    )
