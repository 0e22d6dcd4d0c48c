"""The commented job-file template written by ``feedcheck init``."""

TEMPLATE = """\
# feedcheck job file. Values with units are quoted text: "95 ft", "75 kVA", "5.1 %".
# Lengths take any unit (ft, m); temperatures are "degC". Ids are your own names.
# Results are an aid: verify them against the locally adopted electrical code and
# have a licensed electrician or engineer review the work.

[project]
name = "New project"           # required
site = ""                      # optional: address or area
prepared_by = ""               # optional
date = ""                      # optional, e.g. "2026-12-01"
revision = "A"                 # optional
rules = "na"                   # rule/table set under tables/ ("na" is the one shipped)

[source]                       # the supply: a transformer primary or a service point
voltage = "480 V delta"        # e.g. "480 V delta", "480Y/277 V", "480 V" (with phases = 1);
#                              # up to 35 kV ("13.8 kV", "13800 V delta") when it feeds
#                              # transformers directly (no run from a medium-voltage source)
phases = 3                     # 1 or 3
available_fault = "30 kA"      # three-phase fault current at the source, or "infinite"
# short_circuit = "250 MVA"    # alternative to available_fault: short-circuit power
x_r = 6                        # source X/R (needed unless the fault is "infinite")
# A service stated by the utility's transformer instead (no available_fault, short_circuit
# or x_r then); runs from "source" to a panel are the service conductors:
# service_transformer = "750 kVA"      # its through-fault is computed (infinite bus)
# service_impedance = "5.75 %"         # its nameplate %Z
# service_x_r = 5.5                    # optional: typical by rating when absent
# primary_short_circuit = "infinite"   # or e.g. "500 MVA" (then primary_x_r = 10)
# electrode_conductor = "2/0 AWG Cu"   # service grounding electrode conductor (Table 250.66)
# main_bonding_jumper = "2/0 AWG Cu"   # main bonding jumper (250.28(D))

[[transformer]]
id = "T1"
from = "source"                # "source", or a panel id (then add a [[run]] to it)
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"       # or "120/240 V" (single-phase three-wire), or
#                              # "240/120 V high-leg delta" (four-wire delta, B = high leg)
impedance = "5.0 %"            # nameplate %Z
# x_r = 3.5                    # optional; a typical value by rating is used if absent
primary_device = "110 A"       # fuse or breaker rating on the primary
# primary_device_type = "fuse" # primary over 1000 V: "fuse" or "breaker" (Table 450.3(A))
secondary_device = "250 A"     # optional: device on the secondary (450.3(B) arrangement)
# tap = "+2.5 %"               # optional no-load tap, signed as on the nameplate: "+" is
#                              # above normal and LOWERS the secondary; "-" raises it
#                              # (-5, -2.5, 0, +2.5, +5 %; unsigned or boost/buck refused)
# phases_connected = "A-B"     # single-phase unit on a three-phase feed: its pair of lines
#                              # (absent: chosen to balance the phases, and said so)

[[run]]                        # one conductor run between two elements
id = "F-LP1"
from = "T1"                    # a transformer, a panel, or "source" (service conductors:
#                              # no ground; their grounded conductor as neutral = "...")
to = "LP1"                     # what it feeds: a panel (or a transformer primary)
length = "95 ft"
conductors = "4/0 AWG Cu"      # size and material: "250 kcmil Al", "95 mm2 Cu"
sets = 1                       # parallel sets per phase
insulation = "75 degC"         # 60, 75 or 90 degC, or a type: "THHN", "XHHW-2", "THWN-2"
raceway = "steel"              # steel | aluminum | pvc | cable | free-air
ambient = "30 degC"
current_carrying = 3           # current-carrying conductors in the raceway or cable
ground = "4 AWG Cu"            # equipment grounding conductor (optional)
device = "250 A"               # device at the sending end protecting this run
# termination = "75 degC"      # optional: equipment terminal rating (else the 110.14(C) rule)
# clearing_time = "0.05 s"     # optional: device clearing time for the withstand check
# rooftop_height = "0.5 in"    # optional: raceway height above a sunlit roof
# harmonic_neutral = false     # optional: count the neutral as current-carrying
# tap_rule = "10 ft"           # only for a run with no device: "10 ft", "25 ft",
#                              # "transformer secondary 10 ft" or "transformer secondary 25 ft"
# bonding_jumper = "2 AWG Cu"  # secondary conductors without a device: supply-side bonding
# neutral = "4/0 AWG Cu"       # jumper and grounded conductor (250.30(A)(2), (A)(3))

[[panel]]
id = "LP1"
rating = "225 A"               # bus rating
main_device = "225 A"          # optional (omit for main lugs only)
interrupting = "22 kA"         # equipment short-circuit / interrupting rating
# voltage = "208Y/120 V"       # optional: checked against the feed; a single-phase
#                              # panel on a three-phase feed: "208 V 1ph" (two wires)
# phases_connected = "A-B"     # single-phase panel: its pair of lines (else balanced)
load = "40 kVA"                # demand load (a schedule replaces it when given)
continuous = "10 kVA"          # the continuous part of the load
power_factor = 0.9
# schedule = "LP1.csv"         # optional: panel schedule beside this file (CSV or XLSX)
# occupancy = "other"          # lighting demand: other, dwelling, hospital, hotel, warehouse;
#                              # with area also office, store, school, industrial, ... (220.12)
# area = "12000 ft2"           # floor area served: minimum lighting load of Table 220.12
# series_rating = "65 kA"      # a series-rated combination (240.86(B)) with the device of
# series_upstream = "F-LP1"    # this run on the panel's feed, named on the combination
# series_upstream_device = "250 A"  # as this rating (optional)

# [[motor]]                    # optional: motors (not counted in the panel's load above)
# id = "EF-1"
# panel = "LP1"
# hp = 10                      # or kw = 7.5 (746 W/hp): full-load current from Table
#                              # 430.248/430.250 at the panel's voltage (430.6(A)(1))
# phases = 3                   # optional; default the panel's
# voltage = "200 V"            # optional rated motor voltage; default the panel's
# full_load = "28 A"           # optional nameplate current (overload); not used for sizing
# locked_rotor = "185 A"       # optional; at least the full-load current
# device = "80 A"              # optional branch device, Table 430.52 (430.52(C)(1))
# device_type = "inverse-time-breaker"   # or time-delay-fuse, nontime-delay-fuse, ...
# disconnect = "60 A"          # optional disconnect rating, at least 115 % FLC (430.110(A))
# length = "120 ft"            # optional branch run to the motor (with conductors):
# conductors = "8 AWG Cu"      # 125 % FLC (430.22) and the starting dip at its terminals
# termination = "75 degC"      # optional; default by 110.14(C)(1)

# [options]
# impedance_tolerance = "7.5 %"   # transformer %Z tolerance (IEEE C57.12.00)
# voltage_factor = "none"         # or "iec60909" (c max / c min on fault currents)
# voltage_drop = "recommended"    # or "mandatory": drop limits fail instead of warn
# feeder_drop = "3 %"
# branch_drop = "3 %"
# total_drop = "5 %"

# A standby source (optional; both tables or neither): the transfer switch stands at the
# line side of a panel fed by a run from the source; the generator reaches it by its own
# run. Every figure below the switch is computed for both positions (normal, standby).
# [transfer_switch]
# id = "ATS-1"
# panel = "MDP"                # the panel it feeds (fed by a run from "source")
# rating = "400 A"             # held against the panel's design current
# withstand = "30 kA"          # optional withstand and closing rating (UL 1008)
#
# [generator]
# id = "GEN-1"
# rating = "300 kVA"
# kw = "240 kW"                # optional
# voltage = "480Y/277 V"       # the source's voltage
# subtransient = "14 %"        # X"d on its own rating: I = I_rated / x"d (IEEE Std 141)
# x_r = 15                     # its X/R
# length = "80 ft"             # its run to the transfer switch (run keys: conductors,
# conductors = "500 kcmil Cu"  # sets, insulation, raceway, ambient, current_carrying,
# ground = "3 AWG Cu"          # ground, device, termination)
# device = "400 A"             # its output breaker
"""
