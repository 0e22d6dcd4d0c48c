"""The calc kernels bound to the shipped rule book, for tests.

Kernels take their tables as a required parameter (``tables=``/``data=``); tests
that check a kernel against a published value use the shipped tables, built once
here. A test that needs other tables builds its own book
(``feedcheck.rulebook.build_rulebook(tmp_dir)``) and calls the kernel itself.
"""

from __future__ import annotations

from functools import partial

from feedcheck.calc import ampacity as _ak
from feedcheck.calc import conductor as _ck
from feedcheck.calc import protection as _pk
from feedcheck.calc import selection as _sk
from feedcheck.calc import withstand as _wk
from feedcheck.rulebook import default_rulebook

BOOK = default_rulebook()

# ampacity
adjustment_factor = partial(_ak.adjustment_factor, tables=BOOK.ampacity)
ampacity_a = partial(_ak.ampacity_a, tables=BOOK.ampacity)
ampacity_chain = partial(_ak.ampacity_chain, tables=BOOK.ampacity)
rooftop_adder_c = partial(_ak.rooftop_adder_c, tables=BOOK.ampacity)
# conductor impedance
ac_impedance_computed_ohm_per_m = partial(_ck.ac_impedance_computed_ohm_per_m, data=BOOK.conductors)
ac_impedance_ohm_per_m = partial(_ck.ac_impedance_ohm_per_m, data=BOOK.conductors)
dc_resistance_ohm_per_m = partial(_ck.dc_resistance_ohm_per_m, data=BOOK.conductors)
impedance_method = partial(_ck.impedance_method, data=BOOK.conductors)
# protection
conductor_protection = partial(_pk.conductor_protection, tables=BOOK.protection)
device_min_for_load_a = partial(_pk.device_min_for_load_a, tables=BOOK.protection)
device_protects_conductor = partial(_pk.device_protects_conductor, tables=BOOK.protection)
egc_size = partial(_pk.egc_size, tables=BOOK.protection)
max_device_a = partial(_pk.max_device_a, tables=BOOK.protection)
next_standard_rating_a = partial(_pk.next_standard_rating_a, tables=BOOK.protection)
standard_ratings_a = partial(_pk.standard_ratings_a, tables=BOOK.protection)
# selection
select_conductor = partial(_sk.select_conductor, data=BOOK.sizing)
# withstand
k_adiabatic = partial(_wk.k_adiabatic, data=BOOK.withstand)
k_constant = partial(_wk.k_constant, data=BOOK.withstand)
withstand_current_icea_a = partial(_wk.withstand_current_icea_a, data=BOOK.withstand)
