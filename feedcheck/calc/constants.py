"""Physical and unit constants used by the kernels and the checks (one copy each).

References
----------
International Yard and Pound Agreement (1959): 1 ft = 0.3048 m exactly (the
"international foot"); NIST SP 811 (2008) Appendix B.
"""

from __future__ import annotations

import math

SQRT3 = math.sqrt(3.0)
"""√3, line-to-line over line-to-neutral voltage of a balanced three-phase system."""

M_PER_FT = 0.3048
"""Metres per foot: the international foot, exact (1959 agreement; NIST SP 811)."""

FT_PER_KFT = 1000.0
"""Feet per thousand feet (the length base of NFPA 70 Chapter 9 Table 9)."""
