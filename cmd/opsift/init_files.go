package main

// The files opsift init writes. The parts are invented examples of their
// class, not any manufacturer's data; the starter catalog must pass
// opsift check (init_test.go checks it does).

// starterCatalog is DIR/catalog.d/example.toml.
const starterCatalog = `# opsift catalog: op-amp parameter sets, one [[part]] table each.
#
# Put your own parts in this directory (any number of *.toml files; they are
# read in name order) and check them with:
#
#     opsift check --catalog catalog.d
#
# The parts below are INVENTED examples of their class, to show the keys.
# Replace them with figures from the current manufacturer datasheet of the
# parts you use. Results are advisory; mains-powered, medical and
# safety-critical designs need the applicable standards, local codes and
# qualified review.
#
# VALUES are strings with a unit and an optional SI prefix:
#   p n u (or µ) m k M G   - case matters: m is milli, M is mega
#   "0.5 V/us"  "1.2 MHz"  "250 nA"  "10 kOhm"  "100 pF"  "-40 C"
#   "35 nV/rtHz"  "0.1 pA/rtHz"  "7 uV/K"  "100 dB"  (or "100 V/mV" for aol)
# A bare number where a unit belongs is an error, so a figure can never be
# read in the wrong unit.
#
# FIGURES (gbw, slew, aol, vos, vos_drift, ib, ios, en, in, iq, iout) are
# inline tables with any of:
#   typ     typical value at 25 C (datasheet front page)
#   min     guaranteed minimum at 25 C
#   max     guaranteed maximum at 25 C
#   min_ot  guaranteed minimum over the rated temperature range
#   max_ot  guaranteed maximum over the rated temperature range
#   source  where the figure came from: "table" (default), "graph" (read off
#           a typical-performance curve) or "estimate"
# Guaranteed limits are used as they are; a figure known only as typical is
# derated (bigger-is-better) or inflated (smaller-is-better) by the design's
# [policy] before it is compared. Write min <= typ <= max, and keep the _ot
# limits at least as loose as the 25 C ones.

[[part]]
# id: unique and stable, lower case: a-z 0-9 . _ -
id = "ex-gp2"
name = "Example bipolar dual, general purpose, single supply"
tech = "bipolar"                 # bipolar | cmos | jfet | bicmos
channels = 2                     # op-amps per package
packages = ["soic8", "dip8"]     # the packages you can buy it in
pinout = "dual-a"                # pin-compatibility family: equal value = drop-in footprint
lifecycle = "active"             # active | nrnd (not for new designs) | obsolete
unit_cost = 0.25                 # plain number, in your catalog's currency
temp = ["-40 C", "85 C"]         # rated ambient range

# supply: total span V+ minus V- the part is rated for.
supply = { min = "3 V", max = "30 V" }
# input_cm: common-mode range, from (V- + low) to (V+ + high). This one works
# down to the negative rail and stops 1.5 V short of the positive one.
input_cm = { low = "0 V", high = "-1.5 V" }
# output: swing from (V- + low) to (V+ + high) at the stated load.
output = { low = "0.02 V", high = "-1.5 V", load = "10 kOhm" }

gbw = { typ = "1 MHz", min = "0.7 MHz" }            # gain-bandwidth product
slew = { typ = "0.5 V/us", source = "graph" }       # slew rate, read off a curve
aol = { typ = "100 dB", min = "88 dB" }             # open-loop gain
vos = { typ = "2 mV", max = "5 mV", max_ot = "7 mV" } # offset voltage, a magnitude
vos_drift = { typ = "7 uV/K" }                      # offset drift
ib = { typ = "20 nA", max = "150 nA" }              # input bias current, a magnitude
ios = { typ = "2 nA", max = "30 nA" }               # input offset current
en = { typ = "35 nV/rtHz" }                         # voltage noise density, flat band
in = { typ = "0.1 pA/rtHz" }                        # current noise density
iq = { typ = "0.35 mA", max = "0.6 mA" }            # quiescent current PER CHANNEL
iout = { typ = "30 mA", min = "10 mA" }             # output (short-circuit) current
vdiff_max = "30 V"               # largest allowed differential input voltage
cload = "100 pF"                 # largest capacitive load it stays stable with
cin = "3 pF"                     # input capacitance
en_corner = "200 Hz"             # 1/f corner of en (optional)
datasheet = "https://example.invalid/ex-gp2.pdf"
notes = "Invented example. Replace with a real part's datasheet figures."

[[part]]
id = "ex-rr1"
name = "Example CMOS single, rail-to-rail input and output, low voltage"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
lifecycle = "active"
unit_cost = 0.40
temp = ["-40 C", "125 C"]
supply = { min = "1.8 V", max = "5.5 V" }
# A rail-to-rail input goes a little beyond both rails: low < 0, high > 0.
input_cm = { low = "-0.1 V", high = "0.1 V" }
output = { low = "0.015 V", high = "-0.015 V", load = "10 kOhm" }
gbw = { typ = "10 MHz", min = "7 MHz" }
slew = { typ = "6 V/us", min = "4 V/us" }
aol = { typ = "110 dB", min = "95 dB" }
vos = { typ = "0.3 mV", max = "1.5 mV", max_ot = "2.5 mV" }
vos_drift = { typ = "1.5 uV/K" }
# A CMOS input's bias current is gate leakage: tiny at 25 C, doubling every
# 10 K above it; the worst case takes that into account.
ib = { typ = "1 pA", max = "10 pA", max_ot = "1 nA" }
en = { typ = "12 nV/rtHz" }
iq = { typ = "0.9 mA", max = "1.3 mA" }
iout = { typ = "50 mA" }
cload = "500 pF"
cin = "5 pF"
notes = "Invented example."

[[part]]
id = "ex-fet4"
name = "Example JFET-input quad, low noise, split supply"
tech = "jfet"
channels = 4
packages = ["soic14"]
lifecycle = "nrnd"
unit_cost = 1.10
temp = ["0 C", "70 C"]
supply = { min = "10 V", max = "36 V" }
# A JFET input often cannot reach its negative rail: low > 0.
input_cm = { low = "4 V", high = "-1 V" }
output = { low = "1.5 V", high = "-1.5 V", load = "2 kOhm" }
gbw = { typ = "4 MHz", min = "2.5 MHz" }
slew = { typ = "13 V/us", min = "8 V/us" }
aol = { typ = "200 V/mV", min = "50 V/mV" }   # a ratio, read as dB
vos = { typ = "3 mV", max = "10 mV" }
ib = { typ = "30 pA", max = "200 pA" }
en = { typ = "18 nV/rtHz" }
in = { typ = "0.01 pA/rtHz" }
iq = { typ = "1.4 mA", max = "2.5 mA" }
iout = { typ = "40 mA", source = "estimate" }
vdiff_max = "30 V"
notes = "Invented example; nrnd shows a part you would not pick for a new design."
`

// starterDesign is DIR/design.toml.
const starterDesign = `# opsift design: what the circuit needs from the op-amp.
#
#     opsift derive --design design.toml            the requirements, with formulas
#     opsift rank   --design design.toml --catalog catalog.d
#     opsift --catalog catalog.d --design design.toml   the interactive selector
#
# Values are strings with units, as in the catalog. Results are advisory:
# verify every figure against the current manufacturer datasheet.

title = "Sensor amplifier, single 3.3 V supply"

[supply]
pos = "3.3 V"          # nominal V+ against 0 V
neg = "0 V"            # nominal V-
tolerance = "5 %"      # each non-zero rail moves toward 0 V by this for headroom checks

[environment]
temp = ["-20 C", "70 C"]   # ambient range the board must work over

[choose]                   # hard filters; leave out any you do not need
packages = ["soic8", "sot23-5", "msop8"]   # any of
lifecycle = ["active"]                     # default: anything but obsolete
max_unit_cost = 1.0
supply_current = "2 mA"    # budget for every channel of the packages used

[policy]                   # how figures known only as typical are treated
derate_typ = 0.7           # bigger-is-better (gbw, slew, iout): x 0.7
inflate_typ = 2.0          # smaller-is-better (vos, ib, iq, noise): x 2

[[stage]]
name = "gain"
kind = "noninverting"      # direct | follower | noninverting | inverting | comparator | ...
ref = "1.65 V"             # the node the signal is centred on (mid-supply here)
gain = 11                  # signal gain, V/V
signal = { shape = "sine", peak = "0.1 V", freq = "2 kHz" }   # at the stage input
source_r = "10 kOhm"       # resistance of the source driving the input
load_r = "10 kOhm"         # load on the output
gain_error = "1 %"         # allowed gain error at the signal frequency
dc_error = "50 mV"         # allowed output-referred DC error
`
