/** Invented demo circuit and sources shared by the workloads. */
import { parseLadder, LadderTable } from '../src/core/ladder';
import { pulse } from '../src/core/waveforms';
import { Spectrum, spectrumToTable } from '../src/core/spectrum';
export { rng } from '../test/support/rng';

/** A buck converter's output filter: inductor with DCR, capacitor with ESR and ESL, resistive load. */
export const LADDER_ROWS: (string | number)[][] = [
  ['role', 'kind', 'value', 'tol %', 'name'],
  ['series', 'L', 10e-6, 20, 'L1'],
  ['+', 'R', 0.02, 10, 'RL'],
  ['shunt', 'C', 22e-6, 20, 'C1'],
  ['+', 'R', 0.005, 10, 'ESR'],
  ['+', 'L', 1e-9, 10, 'ESL'],
  ['shunt', 'R', 3.3, 5, 'RLOAD'],
];
export const LADDER: LadderTable = parseLadder(LADDER_ROWS);
export const ELEMENTS = LADDER.rows;

/** Switch-node source: 0…12 V, 40 % duty, 250 kHz, 20 ns edges. */
export const PULSE_ARGS = { low: 0, high: 12, duty: 0.4, f0: 250e3, rise: 20e-9, fall: 20e-9 } as const;

export function source(harmonics: number): Spectrum {
  const p = PULSE_ARGS;
  return pulse(p.low, p.high, p.duty, p.f0, harmonics, p.rise, p.fall, 0);
}

export const sourceTable = (harmonics: number): number[][] => spectrumToTable(source(harmonics));


/** Keeps results alive so the JIT cannot drop the work. */
export let sink = 0;
export function consume(x: number): void {
  sink += x;
}
