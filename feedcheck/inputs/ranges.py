"""The ranges a job file's values must fall in: outside them a value is not a feed this
tool checks (an input error naming the key). One copy, read by every element reader."""

from __future__ import annotations

from ..calc.withstand import MAX_ADIABATIC_S

FAULT_RANGE_A = (100.0, 1.0e6)  # available fault current at the source
DEVICE_RANGE_A = (1.0, 6000.0)  # ratings: 6000 A is the largest standard (NFPA 70 240.6(A))
INTERRUPTING_RANGE_A = (1.0e3, 300.0e3)  # equipment interrupting ratings
DEVICE = (*DEVICE_RANGE_A, "an ampere rating from 1 A to 6000 A")
INTERRUPTING = (*INTERRUPTING_RANGE_A, "an interrupting rating from 1 kA to 300 kA")
# the adiabatic withstand method holds up to MAX_ADIABATIC_S (IEC 60364-4-43:2008 434.5.2)
CLEARING = (0.001, MAX_ADIABATIC_S, f"a clearing time from 0.001 s to {MAX_ADIABATIC_S:g} s")
