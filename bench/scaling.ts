/**
 * Studies of many cells: a chain of n parameters (bench/chains.ts) opened and evaluated
 * (`openStudy` of the JSON text, the report made), n = 1,000 and 10,000, valid and with a
 * wrong first value. Every text is new on each run (so each is parsed); the figure is the
 * median of 5 runs after one untimed run, in processor time (`process.cpuUsage()`, garbage
 * collection included), as on a machine other processes share the wall time adds their
 * share; the wall time is shown beside it. Goal: the 10,000-cell chain under 1 s, and the
 * time per cell of 10,000 within 1.5 times that of 1,000 (linear growth). The report's size
 * per cell is shown too (its budget is checked by test/engine/scaling.test.ts).
 */
import { openStudy } from '../src/engine/session.ts';
import { parameterChain } from './chains.ts';

export interface ScalingRow { readonly measure: string; readonly result: string; readonly goal?: string; readonly met?: boolean }

let salt = 0;

function timeOpen(n: number, wrongFirst: boolean): { ms: number; wallMs: number; bytes: number } {
  const times: number[] = [];
  const walls: number[] = [];
  let bytes = 0;
  for (let r = 0; r < 6; r++) {
    const text = parameterChain(n, { wrongFirst, factor: 1 + ++salt / 1e6 });
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    const opened = openStudy(text);
    if (!opened.ok) throw new Error(`the chain was refused: ${opened.error.message}`);
    const report = opened.session.report();
    const cpu = process.cpuUsage(c0);
    const wall = performance.now() - t0;
    if (r > 0) {
      times.push((cpu.user + cpu.system) / 1000);
      walls.push(wall);
    }
    bytes = JSON.stringify(report).length;
  }
  const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  return { ms: median(times), wallMs: median(walls), bytes };
}

export function scalingBenchmarks(): ScalingRow[] {
  const rows: ScalingRow[] = [];
  for (const wrongFirst of [false, true]) {
    const small = timeOpen(1000, wrongFirst);
    const large = timeOpen(10000, wrongFirst);
    const what = wrongFirst ? 'with a wrong first value' : 'valid';
    const ratio = (large.ms / 10000) / (small.ms / 1000);
    rows.push(
      { measure: `1,000-parameter chain, ${what}: open and evaluate, processor time`, result: `${small.ms.toFixed(0)} ms` },
      { measure: `10,000-parameter chain, ${what}: open and evaluate, processor time`, result: `${large.ms.toFixed(0)} ms`, goal: '< 1000 ms', met: large.ms < 1000 },
      { measure: `10,000-parameter chain, ${what}: the same, wall time`, result: `${large.wallMs.toFixed(0)} ms` },
      { measure: `time per cell, 10,000 / 1,000, ${what}`, result: `${ratio.toFixed(2)}x`, goal: '<= 1.5x', met: ratio <= 1.5 },
      { measure: `report size per cell, 1,000 / 10,000, ${what}`, result: `${(small.bytes / 1000).toFixed(0)} / ${(large.bytes / 10000).toFixed(0)} bytes` },
    );
  }
  return rows;
}
