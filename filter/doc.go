// Package filter is opsift's requirements engine: it decodes a design,
// derives what the op-amp must do, evaluates every part at worst case and
// ranks the candidates by their smallest margin.
//
//	design TOML ─► DecodeDesign ─► *Design (every input: text as written + SI value)
//	                                  │  Fields / Set / Clone / EncodeDesign (editing)
//	                                  ▼
//	               Derive ─► *Plan: Rails, temperatures, policy,
//	                         Global []Requirement + per stage (Template.Derive) []Requirement
//	                                  ▼
//	[]*catalog.Part ─► Evaluate ─► Figures(part, plan) once per part ─► []Result{Checks, margins}
//	                                  ▼
//	                   Rank(results, SortKey) ─► report writers | tui
//
// # Stage templates
//
// A stage kind is a Template (Kind, Params, Derive), one file per kind
// (stage_direct.go, stage_follower.go, stage_noninverting.go,
// stage_inverting.go, stage_comparator.go, stage_relaxation.go,
// stage_sallen_key.go, stage_rail_splitter.go, stage_transimpedance.go)
// that registers itself from init. Derive resolves the stage's circuit
// into its StagePlan (Ref, Values, Texts); a kind with a waveform preview
// also builds the filter/sim circuit from that (StagePlan.Circuit, see
// waveform.go). An unknown kind is an error listing the known kinds, with a
// did-you-mean, never another kind's circuit.
//
// # Derivation rules (G signal gain, NG noise gain, Vp input peak, f
// frequency, ε allowed gain error, default 1 %)
//
//   - Supply: each rail moves by tolerance × its own magnitude; span_min =
//     both rails inward (V+w − V−w, below), span_max = both outward,
//     (pos + tol·|pos|) − (neg − tol·|neg|) (RailsOutward). With 0 V between
//     the rails that is nominal span × (1 ∓ tolerance); V+ 12 V, V− 2 V at
//     10 % gives 8.6 … 11.4 V, not 9 … 11 V. A part passes
//     when its rated supply.min ≤ span_min and span_max ≤ supply.max;
//     margin = the smaller spare in volts / span_min.
//   - Rails for headroom: each rail moved toward the other by the
//     tolerance, V+w = pos − tol·|pos|, V−w = neg + tol·|neg| (toward 0 V
//     when 0 V lies between them; V+ 12 V, V− 2 V, 10 % gives 10.8 V and
//     2.2 V, the span shrinks).
//   - input_range: the signal at the op-amp inputs, ref ± Vp (follower,
//     non-inverting) or the point ref (inverting: the inputs sit at ref),
//     must lie within [V−w + input_cm.low, V+w + input_cm.high].
//   - output_range: ref ± Vo, Vo = G·Vp, within [V−w + output.low,
//     V+w + output.high]; a swing stated at R_spec is scaled to a heavier
//     stage load R_load < R_spec as headroom × R_spec/R_load (linear
//     output-resistance approximation; the check's note says so).
//   - Range margin = the smallest spare volts / span_min.
//   - slew: sine 2π·f·Vo; square 0.8·2Vo/rise (10–90 % of the step).
//   - gain error ε at f, single-pole loop: a part meets it when
//     (1 + NG/Aol)² + (NG·f/GBW)² ≤ 1/(1−ε)² with its own worst-case Aol
//     and GBW (loop-gain relation, Sedra & Smith).
//   - aol: the DC floor Aol ≥ NG·(1 − ε)/ε (circuit.AolForGainError with
//     all of ε): necessary, since below it no GBW helps.
//   - gbw: sine, per part, NG·f/√(1/(1−ε)² − (1 + NG/Aol)²) with the
//     part's own Aol (circuit.GBWForGainError; Requirement.Need). The
//     requirement's Value is the floor as Aol → ∞, NG·f/√(1/(1−ε)² − 1)
//     (≈ 7.02·NG·f at 1 %). A part with no Aol, or one below the aol floor,
//     is held to the ε/4 split instead (circuit.GainErrorBudget: an Aol at
//     NG·(1 − ε/4)/(ε/4) assumed, ≈ 8.09·NG·f at 1 %); the check's note
//     says which. Square: NG·0.35/rise, which does not draw on ε.
//
// Every formula lives in filter/circuit with one test against its named
// source; the templates call it and write the why line.
//   - output_current: Vo/load_r + Vo/feedback_r (when given).
//   - dc_error (when the stage sets it): NG·(Vos + Ib·source_r + Ios·source_r/2) ≤ allowed.
//   - noise (when the stage sets it, allowed output rms; circuit.AmpNoise):
//     NG·√(en²·(B + fe·ln(B/0.1 Hz)) + in²·(Rs² + Rp²)·(B + fi·ln(B/0.1 Hz)) +
//     4kT·(Rs + Rp)·B), Rp = Rf∥Rg when the stage gives its resistors,
//     fe, fi the catalog's 1/f corners, k = 1.380649e-23 J/K, T the
//     design's highest temperature, B = GBW/NG·atan(band·NG/GBW) for a
//     noise_band (widened to its brick-wall equivalent for noise_order n),
//     else π/2·GBW/NG; GBW the part's largest credible figure (typical,
//     not derated) since more bandwidth is more noise. The transimpedance
//     stage integrates its own response (circuit.TIANoise) with the Cf
//     its gbw check reports, the op-amp at its typical GBW.
//   - relaxation gbw: the GBW at which the single-pole period model
//     (circuit.AstablePeriodLimited, slew unlimited) runs at
//     (1 − freq_error)·f0, a period of T0/(1 − freq_error); relaxation
//     slew: both transitions within that growth, T0·ε/(1 − ε);
//     transimpedance gbw, per part: the worst-case GBW whose fitted Cf
//     (the smallest without peaking from that GBW up to the typical,
//     circuit.FeedbackCapForTIASpan; usually the flat one at the worst
//     case) keeps the bandwidth over that span (circuit.GBWForTIAFitted;
//     Requirement.Need, with the part's own cin); the Value is the flat
//     floor circuit.GBWForTIA.
//   - comparator slew: 0.8·(VOH − VOL)/transition, the 10–90 % time
//     between the stage's levels, as the preview measures it.
//   - supply_current (when [choose] sets it): packages × channels × Iq.
//   - limit.<figure> (one per side of each [choose.limit] entry): the
//     part's worst-case figure (FigureFor) against the stated min or max.
//   - vdiff, cload: a stage states the differential input or load
//     capacitance; the part's vdiff_max / cload must reach it.
//   - thd (when a sine stage sets it; Requirement.Simulated): the output
//     THD the time-domain model (filter/sim) measures at the worst-case
//     figures (BuildAmp: derated GBW, slew, Aol, the swing at the load,
//     rails at tolerance) ≤ allowed; harmonics 2…10 over the fundamental,
//     DFT of 5 periods after 20 of settling, 400 points per period, floor
//     0.0001 %. A second pass: only parts that pass every closed-form
//     check are simulated; for the rest the check is unknown ("not
//     simulated"). Basis simulated.
//   - Hard filters (pass/fail, margin null): temperature (the part's rated
//     range covers the design's), package (any of), tech (any of),
//     lifecycle (any of; default anything but obsolete), cost (unit cost ≤
//     max_unit_cost). Supply is a range check with a margin.
//
// # Worst-case figures (Figures)
//
// In order: the over-temperature limit (min_ot/max_ot) when the design's
// range leaves 25 °C; else the guaranteed limit (min/max) moved to the
// range's extreme — Vos + drift·ΔT (drift max, else typical × inflate_typ;
// ΔT the larger distance from 25 °C), FET-input (cmos, jfet) Ib and Ios ×
// 2^(ΔT/10 K) for ΔT above 25 °C, other figures as given; else typical ×
// derate_typ (0.7; bigger is better: GBW, slew, Iout, Aol as a linear gain)
// or × inflate_typ (2.0; smaller is better: Vos, Ib, Ios, en, in, Iq),
// moved by the same rule. A figure given only as min_ot/max_ot is used at
// 25 °C too (the rated range includes it). Policy adds: GBW and slew given
// at 25 °C × (1 − speed_tempco·|ΔT|), bipolar Ib and Ios given at 25 °C ×
// (1 + ib_cold_tempco·ΔT below 25 °C). Basis: guaranteed for limits,
// typical or graph (source = "graph") for typical figures, simulated for
// the thd check's measured figure.
//
// # Margins (fractions; ≥ 0 ⇔ pass)
//
//   - lower bound (min): available/required − 1;
//   - upper bound (max, an allowance): required/available − 1, where
//     required is the allowance and available the part's worst-case value;
//   - range and supply: spare volts / minimum supply span;
//   - figures in dB (aol) compare as the linear gains they stand for:
//     10^((available − required)/20) − 1;
//   - hard filters: none (NaN; null in JSON).
//
// A margin whose magnitude is below TieMargin (1e-9) is 0 and passes: a
// part rated exactly at a limit passes despite floating-point rounding.
//
// A check whose figure the catalog lacks is unknown: no margin, left out of
// the worst margin, and neither pass nor fail unless Options.Strict. A
// candidate's worst margin is its smallest margin over all checks; Binding
// names that check. With n stages: packages = ⌈n/channels⌉, cost =
// packages × unit cost, supply current = packages × channels × Iq.
//
// fmax per stage is the highest sine frequency at the stage's amplitude at
// which slew and gbw still pass: min(SR/(2π·Vo), GBW·√(1/(1−ε)² − (1 +
// NG/Aol)²)/NG) with the part's Aol as in its gbw check (the ε/4 split's
// Aol without one), the inverses of the two requirement formulas
// (circuit.FullPowerBandwidth, circuit.MaxFreqForGainError).
//
// # Speed
//
// Evaluate computes each part's worst-case figures once and shares them
// across its checks; parts are split over the CPUs above a few thousand.
// Options.Summary keeps only the per-part summary (the per-keystroke path
// of the interactive selector) and Explain fills in the checks of the rows
// on screen. Rank sorts small precomputed keys and moves each Result once.
// BenchmarkEvaluate measures edit → Derive → Evaluate → Rank.
//
// Rank puts passing candidates first (by worst margin, largest first,
// ties by cost, then id; or by cost, supply current, fmax or id), then
// failing ones by fewest failing checks and nearest miss.
package filter
