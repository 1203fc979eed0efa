/**
 * Size bounds, chosen so one cell stays within about 50 ms on a 2-core CI machine (issue 6 tunes them;
 * the README's function reference lists them). Beyond a bound the functions return #NUM! naming it.
 */
export const LIMITS = {
  harmonics: 10000,       // highest harmonic order N in a generated or parsed spectrum
  ladderRows: 200,        // rows in a ladder table
  samples: 1 << 18,       // samples given to HC.SAMPLED
  pwlPoints: 10000,       // breakpoints given to HC.PWL
  sweep: 10000,           // frequencies in one IMPEDANCE/TRANSFER sweep
  tracePoints: 10000,     // rows spilled by HC.TRACE
  tracePeriods: 1000,     // periods spanned by HC.TRACE
  trials: 10000,          // Monte Carlo trials in HC.SPREAD
  corners: 1 << 16,       // tolerance corners in HC.SPREAD
  combine: 64,            // spectra given to HC.COMBINE
} as const;
