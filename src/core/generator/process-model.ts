// The invented process the demo lot is drawn from: nominal device parameters, their spreads, and
// the wafer-level patterns. Magnitudes follow DOMAIN.md's low-standby 22 nm planar numbers
// (CACTI/ITRS-derived: Ion about 730 uA/um, Ioff about 24 pA/um at 0.8 V) for W = 1 um devices.

/** One device type, in magnitudes (PMOS thresholds and currents become negative only on output). */
export interface DeviceModel {
  /** Nominal |Vt_sat| in V, at Vds = Vdd. */
  vtSat: number;
  /** Die-to-die random |Vt| spread (normal sigma) in V. */
  vtRandomSigma: number;
  /** Wafer-to-wafer spread of the wafer's mean |Vt| in V. */
  waferOffsetSigma: number;
  /** Subthreshold swing S in V/decade and its die-to-die sigma. */
  swing: number;
  swingSigma: number;
  /** Constant-current threshold convention: Vt is read where |Id| = icc * wOverL. */
  icc: number;
  wOverL: number;
  /** Alpha-power drive factor K in A/V^alpha and the index alpha (Sakurai & Newton 1990). */
  k: number;
  alpha: number;
  /** DIBL in V/V (mV/V / 1000) and its die-to-die sigma. */
  dibl: number;
  diblSigma: number;
  /** Drive noise independent of Vt (mobility, series resistance): sigma of ln(Ion). */
  driveSigma: number;
  /** Gate leakage: median |Ig| in A and the log10 sigma of its log-normal spread. */
  igMedian: number;
  igLog10Sigma: number;
}

export interface ProcessModel {
  n: DeviceModel;
  p: DeviceModel;
  /** Supply and gate bias for Ion and Ioff, and the drain bias of Vt_sat, in V. */
  vdd: number;
  /** Low drain bias of Vt_lin in V. */
  vdLin: number;
  /**
   * Radial bowl of |Vt| per wafer: bowl * (r^2 / R^2 - 0.5), R the usable radius. The amplitude is
   * drawn per wafer (normal, mean and sigma in V); the -0.5 keeps the wafer median where it was.
   */
  bowlMean: number;
  bowlSigma: number;
  /** Sigma of the fixed |Vt| offset of each position in the exposure field, in V. */
  reticleSigma: number;
  /** Standby current Isb = isbDevices * (|Ioff_n| + |Ioff_p|) * log-normal noise + background. */
  isbDevices: number;
  isbBackground: number;
  isbLog10Sigma: number;
}

/** Overrides for a ProcessModel; device fields may be given one by one. */
export interface ProcessOverrides extends Partial<Omit<ProcessModel, 'n' | 'p'>> {
  n?: Partial<DeviceModel>;
  p?: Partial<DeviceModel>;
}

/**
 * Default process. NMOS: |Vt_sat| 0.42 V, S 85 mV/dec, Icc 100 nA (JESD28-A) and W/L = 1/0.05 give
 * Ioff = 2 uA * 10^(-0.42/0.085) = 22.9 pA; K = 2.57e-3 A/V^1.3 gives Ion = K * 0.38^1.3 = 731 uA.
 * PMOS: |Vt_sat| 0.40 V, S 90 mV/dec, Icc 25 nA (JESD60) give 18 pA; weaker hole drive, about
 * 420 uA (a PMOS/NMOS drive ratio near 0.55 is an invented but ordinary choice). The spreads are
 * chosen so that the within-wafer log10 sigma of Ioff is about 0.065 decade.
 */
export const DEFAULT_PROCESS: ProcessModel = {
  n: {
    vtSat: 0.42,
    vtRandomSigma: 0.004,
    waferOffsetSigma: 0.003,
    swing: 0.085,
    swingSigma: 0.0005,
    icc: 100e-9,
    wOverL: 1 / 0.05,
    k: 2.57e-3,
    alpha: 1.3,
    dibl: 0.09,
    diblSigma: 0.008,
    driveSigma: 0.02,
    igMedian: 3e-12,
    igLog10Sigma: 0.12,
  },
  p: {
    vtSat: 0.4,
    vtRandomSigma: 0.0045,
    waferOffsetSigma: 0.003,
    swing: 0.09,
    swingSigma: 0.0006,
    icc: 25e-9,
    wOverL: 1 / 0.05,
    k: 1.38e-3,
    alpha: 1.3,
    dibl: 0.08,
    diblSigma: 0.008,
    driveSigma: 0.02,
    igMedian: 1.2e-12,
    igLog10Sigma: 0.12,
  },
  vdd: 0.8,
  vdLin: 0.05,
  bowlMean: 0.008,
  bowlSigma: 0.004,
  reticleSigma: 0.0015,
  isbDevices: 4000,
  isbBackground: 1e-9,
  isbLog10Sigma: 0.03,
};

/** DEFAULT_PROCESS with the given fields replaced. */
export function resolveProcess(overrides: ProcessOverrides = {}): ProcessModel {
  return {
    ...DEFAULT_PROCESS,
    ...overrides,
    n: { ...DEFAULT_PROCESS.n, ...overrides.n },
    p: { ...DEFAULT_PROCESS.p, ...overrides.p },
  };
}
