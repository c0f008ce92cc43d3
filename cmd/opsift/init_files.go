package main

import "strings"

// The files opsift init writes. The parts are invented examples of their
// class, not any manufacturer's data; the starter catalog must pass
// opsift check (init_test.go checks it does).

// starterCatalog is DIR/catalog.d/example.toml.
const starterCatalog = `#:schema ../` + catalogSchemaFile + `
# opsift catalog: op-amp parameter sets, one [[part]] table each.
#
# Put your own parts in this directory (any number of *.toml files; they are
# read in name order) and check them with:
#
#     opsift check --catalog catalog.d
#
# The first line points editors with a TOML language server (taplo, Even
# Better TOML) at the schema opsift init wrote beside catalog.d, so keys
# are completed and checked as you type; opsift schema catalog prints it.
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
# read in the wrong unit. A value far outside what any op-amp has (a GBW of
# "5 mHz", a slew of "10 MV/us") is an error naming the plausible range, and
# text holding control characters (escape sequences) is refused: catalogs
# are shared, so opsift never passes such text to a terminal.
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
unit_cost = 0.24                 # plain number, in your catalog's currency
temp = ["-40 C", "85 C"]         # rated ambient range

# supply: total span V+ minus V- the part is rated for.
supply = { min = "3.2 V", max = "27 V" }
# input_cm: common-mode range, from (V- + low) to (V+ + high). This one works
# down to the negative rail and stops 1.6 V short of the positive one.
input_cm = { low = "0 V", high = "-1.6 V" }
# output: swing from (V- + low) to (V+ + high) at the stated load.
output = { low = "0.04 V", high = "-1.3 V", load = "10 kOhm" }

gbw = { typ = "0.95 MHz", min = "0.6 MHz" }         # gain-bandwidth product
slew = { typ = "0.45 V/us", source = "graph" }      # slew rate, read off a curve
aol = { typ = "98 dB", min = "86 dB" }              # open-loop gain
vos = { typ = "1.8 mV", max = "5.6 mV", max_ot = "7.3 mV" } # offset voltage, a magnitude
vos_drift = { typ = "6.5 uV/K" }                    # offset drift
ib = { typ = "26 nA", max = "165 nA" }              # input bias current, a magnitude
ios = { typ = "2.7 nA", max = "33 nA" }             # input offset current
en = { typ = "41 nV/rtHz" }                         # voltage noise density, flat band
in = { typ = "0.08 pA/rtHz" }                       # current noise density
iq = { typ = "0.29 mA", max = "0.48 mA" }           # quiescent current PER CHANNEL
iout = { typ = "27 mA", min = "14 mA" }             # output (short-circuit) current
vdiff_max = "27 V"               # largest allowed differential input voltage
cload = "130 pF"                 # largest capacitive load it stays stable with
cin = "3.5 pF"                     # input capacitance
en_corner = "180 Hz"             # 1/f corner of en (optional)
datasheet = "https://example.invalid/ex-gp2.pdf"
notes = "Invented example. Replace with a real part's datasheet figures."

[[part]]
id = "ex-rr1"
name = "Example CMOS single, rail-to-rail input and output, low voltage"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
lifecycle = "active"
unit_cost = 0.42
temp = ["-40 C", "125 C"]
supply = { min = "2.1 V", max = "5.5 V" }
# A rail-to-rail input goes a little beyond both rails: low < 0, high > 0.
input_cm = { low = "-0.1 V", high = "0.15 V" }
output = { low = "0.02 V", high = "-0.017 V", load = "10 kOhm" }
gbw = { typ = "8.5 MHz", min = "6.1 MHz" }
slew = { typ = "5.2 V/us", min = "3.6 V/us" }
aol = { typ = "108 dB", min = "96 dB" }
vos = { typ = "0.4 mV", max = "1.7 mV", max_ot = "2.3 mV" }
vos_drift = { typ = "1.4 uV/K" }
# A CMOS input's bias current is gate leakage: tiny at 25 C, doubling every
# 10 K above it; the worst case takes that into account.
ib = { typ = "0.6 pA", max = "9 pA", max_ot = "0.7 nA" }
en = { typ = "13 nV/rtHz" }
iq = { typ = "0.74 mA", max = "1.07 mA" }
iout = { typ = "46 mA" }
cload = "420 pF"
cin = "4.5 pF"
notes = "Invented example."

[[part]]
id = "ex-fet4"
name = "Example JFET-input quad, low noise, split supply"
tech = "jfet"
channels = 4
packages = ["soic14"]
lifecycle = "nrnd"
unit_cost = 1.15
temp = ["-20 C", "75 C"]
supply = { min = "9.5 V", max = "33 V" }
# A JFET input often cannot reach its negative rail: low > 0.
input_cm = { low = "3.3 V", high = "-0.7 V" }
output = { low = "1.3 V", high = "-1.4 V", load = "2 kOhm" }
gbw = { typ = "4.6 MHz", min = "2.9 MHz" }
slew = { typ = "12 V/us", min = "7.4 V/us" }
aol = { typ = "170 V/mV", min = "45 V/mV" }   # a ratio, read as dB
vos = { typ = "2.1 mV", max = "7.8 mV" }
ib = { typ = "22 pA", max = "145 pA" }
en = { typ = "16 nV/rtHz" }
in = { typ = "0.011 pA/rtHz" }
iq = { typ = "1.3 mA", max = "2.05 mA" }
iout = { typ = "34 mA", source = "estimate" }
vdiff_max = "29 V"
notes = "Invented example; nrnd shows a part you would not pick for a new design."
`

// cautionComment is the full caution as TOML comment lines of at most 78
// columns, for the head of the design file.
var cautionComment = commentLines("CAUTION: "+caution, 76)

// starterDesign is DIR/design.toml. It carries the full caution.
var starterDesign = `#:schema ./` + designSchemaFile + `
# opsift design: what the circuit needs from the op-amp.
#
#     opsift derive --design design.toml            the requirements, with formulas
#     opsift rank   --design design.toml --catalog catalog.d
#     opsift --catalog catalog.d --design design.toml   the interactive selector
#
# Values are strings with units, as in the catalog. The first line points
# editors with a TOML language server at the schema beside this file.
#
` + cautionComment + `

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

# [choose.limit]           # bounds on any catalog figure, checked at worst case
# vos = { max = "5 mV" }   # over the temperature range above, like every check
# ib = { max = "100 pA" }  # (keys: gbw, slew, aol, vos, vos_drift, ib, ios, en,
# gbw = { min = "1 MHz", max = "20 MHz" }   # in, iq, iout, vdiff_max, cload, ...)

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

// commentLines wraps text at spaces into "# " comment lines of at most
// width characters of text each.
func commentLines(text string, width int) string {
	var lines []string
	line := ""
	for _, w := range strings.Fields(text) {
		if line != "" && len(line)+1+len(w) > width {
			lines = append(lines, "# "+line)
			line = ""
		}
		if line != "" {
			line += " "
		}
		line += w
	}
	if line != "" {
		lines = append(lines, "# "+line)
	}
	return strings.Join(lines, "\n")
}
