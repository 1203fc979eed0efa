import { scaledExtremes } from './extremes-scaled';
import { LadderTable } from './ladder';
import { SourceKind } from './network';
import { elementResponses } from './response';
import { power, rms } from './measures';
import { makeSpectrum, Spectrum } from './spectrum';
import { numError } from './errors';
import { grouped, LIMITS } from './limits';

/**
 * Per-part stress (DESIGN §3 HC.STRESS): for every ladder row, the RMS and largest |value| over a period of
 * its current and voltage, and the mean power it absorbs. All rows come from one network solve per harmonic
 * (elementResponses); sign conventions are those of response.ts, so power > 0 means the part absorbs it.
 *
 * RMS is Parseval's sum, x_rms² = X₀² + Σ |X_n|²/2, and mean power Re Σ V_n·conj(I_n)/2 + V₀·I₀ (measures.ts),
 * exact for the truncated series (cross terms between different harmonics average to zero over a period). Peaks are the
 * waveform estimates of extremes.ts (jumps modelled, so an inductor's square-wave voltage reports its level,
 * not the Gibbs overshoot of the truncated series); largest |x| = max(|max|, |min|).
 */

export interface StressOptions {
  /** One value per ladder row replacing the value column (DESIGN §2 values override). */
  values?: ArrayLike<number>;
  /** 'voltage' (default): the spectrum is the source voltage; 'current': a current pushed into node 1. */
  source?: SourceKind;
}

/** One entry per ladder row, in ladder order. Currents in A, voltages in V, power in W. */
export interface Stress {
  rows: number;
  iRms: Float64Array;
  iPeak: Float64Array;
  vRms: Float64Array;
  vPeak: Float64Array;
  power: Float64Array;
}

export function stress(spec: Spectrum, table: LadderTable, opts: StressOptions = {}): Stress {
  const points = spec && spec.re ? spec.re.length : 0;
  if (table && table.rows * points > LIMITS.stressWork) {
    throw numError(
      `STRESS of ${table.rows} ladder rows at ${grouped(points)} harmonics (n = 0…${points - 1}) makes ` +
        `${grouped(table.rows * points)} row-harmonics; at most ${grouped(LIMITS.stressWork)} are evaluated in one cell ` +
        '(each row needs two searches for its peaks). Use fewer harmonics, or fewer ladder rows.',
    );
  }
  const res = elementResponses(spec, table, { source: opts.source, values: opts.values });
  const rows = table.rows;
  const stride = res.harmonics + 1;
  const out: Stress = {
    rows,
    iRms: new Float64Array(rows),
    iPeak: new Float64Array(rows),
    vRms: new Float64Array(rows),
    vPeak: new Float64Array(rows),
    power: new Float64Array(rows),
  };
  // Two scratch spectra, refilled for each row.
  const v = makeSpectrum(res.f0, res.harmonics);
  const i = makeSpectrum(res.f0, res.harmonics);
  for (let r = 0; r < rows; r++) {
    const base = r * stride;
    for (let n = 0; n < stride; n++) {
      v.re[n] = res.vRe[base + n];
      v.im[n] = res.vIm[base + n];
      i.re[n] = res.iRe[base + n];
      i.im[n] = res.iIm[base + n];
    }
    out.iRms[r] = rms(i);
    out.vRms[r] = rms(v);
    out.power[r] = power(v, i);
    out.iPeak[r] = largestMagnitude(i);
    out.vPeak[r] = largestMagnitude(v);
  }
  return out;
}

/** Largest |x(t)| over a period. */
function largestMagnitude(s: Spectrum): number {
  let any = false;
  for (let n = 0; n < s.re.length && !any; n++) any = s.re[n] !== 0 || s.im[n] !== 0;
  if (!any) return 0; // a part that carries nothing (e.g. a resistor across a short at every harmonic)
  const e = scaledExtremes(s);
  return Math.max(Math.abs(e.max), Math.abs(e.min));
}
