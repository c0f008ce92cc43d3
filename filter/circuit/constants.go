package circuit

// Boltzmann is the Boltzmann constant k in J/K, exact since the 2019
// redefinition of the SI base units (BIPM, SI Brochure, 9th edition).
const Boltzmann = 1.380649e-23

// ZeroCelsius is 0 °C in kelvin (exact by the definition of the Celsius scale).
const ZeroCelsius = 273.15

// RiseBandwidth is the product of 10–90 % rise time and −3 dB bandwidth used
// for a single-pole response. The exact value is ln 9 / (2π) ≈ 0.3497; the
// trade rounds it to 0.35 (0.09 % conservative), and DESIGN.md fixes 0.35.
const RiseBandwidth = 0.35

// TenToNinety is the share of a full step covered between the 10 % and 90 %
// points, the definition of rise and transition time used throughout.
const TenToNinety = 0.8
