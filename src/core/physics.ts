// Device physics the analysis and the demo generator stand on: thermal voltage, subthreshold swing,
// constant-current Vt <-> Ioff, DIBL, the alpha-power drive law and the Ion-Ioff trade-off slope.
// All functions work on magnitudes (volts, amperes, positive numbers); PMOS signs are the caller's
// business, as testers report them negative but the physics is the same.

/** Boltzmann constant k in J/K, exact by definition (SI Brochure, 9th ed., BIPM 2019). */
export const BOLTZMANN = 1.380649e-23;

/** Elementary charge q in C, exact by definition (SI Brochure, 9th ed., BIPM 2019). */
export const ELEMENTARY_CHARGE = 1.602176634e-19;

/** Offset between the Celsius and kelvin scales (SI Brochure, 9th ed., 2019: t/°C = T/K - 273.15). */
const CELSIUS_ZERO_IN_KELVIN = 273.15;

/**
 * Thermal voltage kT/q in volts.
 * @param kelvin absolute temperature in K
 * @example thermalVoltage(300) // 0.025852 V
 */
export function thermalVoltage(kelvin: number): number {
  if (!(kelvin > 0)) throw new RangeError('thermalVoltage requires a positive absolute temperature');
  return (BOLTZMANN * kelvin) / ELEMENTARY_CHARGE;
}

/** Converts a temperature in degrees Celsius to kelvin (SI Brochure, 9th ed., 2019). */
export function celsiusToKelvin(celsius: number): number {
  return celsius + CELSIUS_ZERO_IN_KELVIN;
}

/**
 * Subthreshold swing S = n * (kT/q) * ln 10, in volts per decade of drain current
 * (textbook subthreshold form, e.g. Weste & Harris, "CMOS VLSI Design"). n = 1 is the ideal limit,
 * 59.53 mV/decade at 300 K.
 * @param kelvin absolute temperature in K
 * @param n subthreshold slope factor (>= 1 for a real MOSFET)
 */
export function idealSwing(kelvin: number, n = 1): number {
  return n * thermalVoltage(kelvin) * Math.LN10;
}

export interface ThresholdConvention {
  /** Subthreshold swing S in V/decade. */
  swing: number;
  /** Constant current Icc per square in A (JEDEC JESD28-A suggests 0.1 uA for NMOS). */
  icc: number;
  /** Drawn W/L of the device; the threshold is read where Id = Icc * W/L. */
  wOverL: number;
}

/**
 * Off-state current from a constant-current threshold: Ioff = Icc * W/L * 10^(-Vt/S).
 * Derived from the subthreshold form Id = I0 exp((Vgs - Vt)/(n kT/q)) at Vgs = 0, with Vt defined
 * as the Vgs where Id = Icc * W/L (JEDEC dictionary, "constant-current threshold voltage"), and
 * Vds >> kT/q so the drain factor (1 - exp(-Vds q/kT)) is 1. Vt is the threshold at the drain bias
 * Ioff is measured at (Vt_sat for Ioff at Vds = Vdd).
 * @returns Ioff in A
 */
export function ioffFromVt({ vt, swing, icc, wOverL }: ThresholdConvention & { vt: number }): number {
  if (!(swing > 0)) throw new RangeError('ioffFromVt requires a positive swing');
  return icc * wOverL * 10 ** (-vt / swing);
}

/**
 * Inverse of ioffFromVt: Vt = S * log10(Icc * W/L / Ioff).
 * @returns Vt in V
 */
export function vtFromIoff({ ioff, swing, icc, wOverL }: ThresholdConvention & { ioff: number }): number {
  if (!(ioff > 0)) throw new RangeError('vtFromIoff requires a positive off-state current');
  return swing * Math.log10((icc * wOverL) / ioff);
}

/**
 * Drain-induced barrier lowering, DIBL = (Vt_lin - Vt_sat) / (Vd_sat - Vd_lin), in V/V.
 * The trade quotes it in mV/V: multiply the result by 1000 (0.2 V/V = 200 mV/V).
 * @param vtLin threshold at the low drain bias vdLin
 * @param vtSat threshold at the high drain bias vdSat
 */
export function dibl(vtLin: number, vtSat: number, vdLin: number, vdSat: number): number {
  if (vdSat === vdLin) throw new RangeError('dibl requires two different drain biases');
  return (vtLin - vtSat) / (vdSat - vdLin);
}

export interface AlphaPowerInput {
  /** Drive factor K in A/V^alpha. */
  k: number;
  vgs: number;
  vt: number;
  /** Velocity-saturation index, about 1.2-1.5 for short channels (Sakurai & Newton 1990). */
  alpha: number;
}

/**
 * Saturation drain current by the alpha-power law, Id_sat = K * (Vgs - Vt)^alpha
 * (T. Sakurai and A. R. Newton, "Alpha-power law MOSFET model and its applications to CMOS
 * inverter delay and other formulas", IEEE JSSC 25(2):584-594, 1990). Zero at and below Vt: the
 * model describes only the above-threshold drive.
 * @returns Ion in A
 */
export function alphaPowerIon({ k, vgs, vt, alpha }: AlphaPowerInput): number {
  if (vgs <= vt) return 0;
  return k * (vgs - vt) ** alpha;
}

export interface TradeoffInput {
  alpha: number;
  /** Subthreshold swing in V/decade. */
  swing: number;
  vdd: number;
  vt: number;
}

/**
 * Slope of the Ion-Ioff trade-off when only Vt moves: d ln(Ion) / d log10(Ioff) = alpha*S/(Vdd - Vt).
 * Derived from the alpha-power law (d ln Ion / dVt = -alpha/(Vdd - Vt)) and the constant-current
 * subthreshold form (d log10 Ioff / dVt = -1/S). exp(slope) - 1 is the fractional Ion gain per
 * decade of Ioff, e.g. +24.7 % for alpha 1.3, S 85 mV/dec, Vdd 0.8 V, Vt 0.30 V.
 */
export function tradeoffSlope({ alpha, swing, vdd, vt }: TradeoffInput): number {
  if (!(vdd > vt)) throw new RangeError('tradeoffSlope requires Vdd above Vt');
  return (alpha * swing) / (vdd - vt);
}
