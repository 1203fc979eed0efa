/**
 * Size bounds, chosen so that one cell stays within about 50 ms on a 2-core CI machine (measured in plain
 * Node 20; the README's robustness section lists each bound with its measured worst case). Beyond a bound the
 * functions return #NUM! naming it and saying what to reduce.
 *
 * Single sizes bound the arrays; the work bounds (…Work) bound products of sizes where the cost grows with
 * the product (every PWL segment at every harmonic, every ladder row at every frequency, every tolerance case
 * at every harmonic), so that each size may reach its own bound when the others are small.
 */
export const LIMITS = {
  harmonics: 10000,       // highest harmonic order N in a generated or parsed spectrum
  spectrumRows: 20002,    // data rows in one spectrum table (repeated n add; blank rows are not counted)
  ladderRows: 200,        // element rows in a ladder table
  samples: 1 << 17,       // samples given to HC.SAMPLED (131 072)
  pwlPoints: 10000,       // breakpoints given to HC.PWL
  pwlWork: 1_500_000,     // HC.PWL: points × (harmonics + 1)
  sweep: 10000,           // frequencies in one IMPEDANCE/TRANSFER sweep
  networkWork: 1_000_000, // IMPEDANCE/TRANSFER/RESPONSE: ladder rows × (frequencies or harmonics + 1)
  stressWork: 15_000,     // HC.STRESS: ladder rows × (harmonics + 1) (two peak searches per row)
  tracePoints: 10000,     // rows spilled by HC.TRACE
  tracePeriods: 1000,     // periods spanned by HC.TRACE
  trials: 10000,          // Monte Carlo trials in HC.SPREAD
  corners: 1 << 16,       // tolerance corners in HC.SPREAD
  spreadWork: 1_500_000,  // HC.SPREAD: (cases + 1) × (harmonics + 1) × (ladder rows + measure weight)
  combine: 64,            // spectra given to HC.COMBINE
  combineRows: 40_008,    // HC.COMBINE: data rows of all its spectra together
  rangeCells: 1 << 20,    // cells in one range argument (one whole worksheet column)
  textLength: 256,        // characters in a text read as a value, a choice or a name
} as const;

/**
 * Measure weights of LIMITS.spreadWork, in units of one ladder row at one harmonic: the search for the
 * largest and smallest value (peak, valley, pp, crest) costs about as much as solving 100 ladder rows.
 */
export const SPREAD_MEASURE_WEIGHT = { extremes: 100, sums: 10 } as const;

/** "1,000,000" for messages. */
export const grouped = (n: number): string => Math.round(n).toString().replace(/\B(?=(\d{3})+(?!\d))/g, ',');

/**
 * IMPEDANCE, TRANSFER and RESPONSE solve every ladder row at every frequency: refuse more than
 * LIMITS.networkWork row-frequencies, saying what to reduce. `points` counts frequencies (a sweep) or
 * harmonics + 1 (a spectrum); `what` is "frequencies" or "harmonics (n = 0…N)".
 */
export function networkWorkMessage(rows: number, points: number, what: string): string | undefined {
  const work = rows * points;
  if (work <= LIMITS.networkWork) return undefined;
  return (
    `the ladder's ${rows} rows at ${grouped(points)} ${what} make ${grouped(work)} row-frequencies; at most ` +
    `${grouped(LIMITS.networkWork)} are solved in one cell. Use fewer ${what.split(' ')[0]} or fewer ladder rows.`
  );
}
