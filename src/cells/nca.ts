/**
 * An nca cell: non-compartmental analysis of one concentration-time profile from a data cell
 * (numerics in numerics/nca/nca.ts). Defines Cmax, tmax, Clast, tlast, AUClast, AUCinf, AUCextrap
 * (percent), lambda_z, t_half, CL (CL/F after an extravascular dose), Vz, AUMClast, MRT and
 * r2adj, each with the cell's prefix, in the units of the data and the dose.
 */
import { NCA_RESULTS, type NcaCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Outcome, RunContext } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput, ReportQuantity } from '../engine/report.ts';
import { type Field, field, usesOf, lookupFrom, finiteQuantityOf, FieldError, fail, guarded, shownAs } from './fields.ts';
import { type Quantity, report, describe } from '../units/quantity.ts';
import { sameDim, describeDim, TIME, TEMPERATURE } from '../units/dimension.ts';
import { type DisplayUnit, formatUnit, mulUnits, unitDim, NO_UNIT } from '../units/units.ts';
import { ncaProfile } from '../numerics/nca/nca.ts';
import { quantitySig } from './signatures.ts';

export function ncaNodes(cell: NcaCell, at: string): Array<GraphNode<NodeOutput<'nca'>>> {
  const problems: CellError[] = [];
  const dose = field(cell.dose, `${at}.dose`, problems);
  const duration = cell.duration !== undefined ? field(cell.duration, `${at}.duration`, problems) : undefined;
  const prefix = typeof cell.prefix === 'string' ? cell.prefix : '';
  return [{
    key: `${cell.id}/nca`,
    cell: cell.id,
    defines: NCA_RESULTS.map((n) => ({ name: `${prefix}${n}`, path: `${at}.prefix` })),
    uses: [...usesOf([dose, duration]), ...(typeof cell.data === 'string' ? [{ name: cellRef(cell.data), path: `${at}.data` }] : [])],
    allowsTime: false,
    signature: JSON.stringify(cell),
    problems,
    run: (ctx) => guarded(() => runNca(cell, at, prefix, dose!, duration, ctx)),
  }];
}

function runNca(cell: NcaCell, at: string, prefix: string, doseField: Field, durationField: Field | undefined, ctx: RunContext): Outcome<NodeOutput<'nca'>> {
  const b = ctx.binding(cellRef(cell.data));
  if (b?.kind !== 'data') fail(`${at}.data`, `cell "${cell.data}" is not a data cell`);
  const table = (b as Extract<Binding, { kind: 'data' }>).table;
  const col = (name: string, what: string, path: string) => {
    const i = table.columns.findIndex((c) => c.name === name);
    if (i < 0) fail(path, `the data cell "${cell.data}" has no column "${name}" for ${what} (its columns: ${table.columns.map((c) => c.name).join(', ')})`);
    return i;
  };
  const ti = col(cell.time, 'the time', `${at}.time`);
  const ci = col(cell.concentration, 'the concentration', `${at}.concentration`);
  const tUnit = table.columns[ti].unit;
  const cUnit = table.columns[ci].unit;
  if (!sameDim(unitDim(tUnit), TIME)) fail(`${at}.time`, `the column "${cell.time}" must hold times; its unit is of ${describeDim(unitDim(tUnit))}`, 'unit');
  // a temperature has no area under its curve, clearance or volume; on degC or degF its
  // figures would be readings of the kelvin scale (74.1 degC read as 347.25)
  if (sameDim(unitDim(cUnit), TEMPERATURE)) {
    fail(`${at}.concentration`, `the column "${cell.concentration}" holds temperatures (${formatUnit(cUnit)}): a profile summary needs concentrations or amounts, such as mg / L`, 'unit');
  }
  const lookup = lookupFrom(ctx);
  const dose = finiteQuantityOf(doseField, lookup);
  const duration = durationField ? finiteQuantityOf(durationField, lookup) : undefined;
  if (duration && !sameDim(duration.dim, TIME)) fail(durationField!.path, `the infusion duration must be a time; it is ${describe(duration)}`, 'unit');

  const t = table.rows.map((r) => r[ti] as number);
  const c = table.rows.map((r) => r[ci]);
  const result = ncaProfile({
    t, c, dose: dose.si, route: cell.route, duration: duration?.si, auc: cell.auc ?? 'linear-up-log-down', terminal: cell.terminal ?? 'auto',
  });
  if (!result.ok) {
    const p = result.problems[0];
    const path = p?.field === 'dose' ? doseField.path : p?.field === 'duration' && durationField ? durationField.path
      : p?.field === 't' || p?.field === 'c' ? `${at}.data` : at;
    fail(path, result.message);
  }
  const r = result as Extract<typeof result, { ok: true }>;

  const q = (si: number, unit: DisplayUnit): Quantity => ({ si, dim: unitDim(unit), unit });
  const auc = mulUnits(cUnit, tUnit);
  const perTime = mulUnits(NO_UNIT, tUnit, -1);
  const clUnit = mulUnits(dose.unit, auc, -1);
  const vUnit = mulUnits(clUnit, perTime, -1);
  const values: Array<[string, number | null, DisplayUnit]> = [
    ['Cmax', r.Cmax, cUnit], ['tmax', r.tmax, tUnit], ['Clast', r.Clast, cUnit], ['tlast', r.tlast, tUnit],
    ['AUClast', r.AUClast, auc], ['AUCinf', r.AUCinf, auc], ['AUCextrap', r.AUCextrapPercent, NO_UNIT],
    ['lambda_z', r.lambdaZ, perTime], ['t_half', r.tHalf, tUnit], ['CL', r.CL, clUnit], ['Vz', r.Vz, vUnit],
    ['AUMClast', r.AUMClast, mulUnits(auc, tUnit)], ['MRT', r.MRT, tUnit], ['r2adj', r.r2adj, NO_UNIT],
  ];
  const out: Record<string, ReportQuantity> = {};
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  for (const [name, si, unit] of values) {
    const full = `${prefix}${name}`;
    if (si === null || !Number.isFinite(si)) {
      reasons.set(full, `"${full}" is not defined for this profile${r.warnings.length ? `: ${r.warnings[0]}` : ''}`);
      continue;
    }
    const quantity = shownAs(q(si, unit), cell.units?.[name], `${at}.units.${name}`);
    out[full] = report(quantity);
    bindings.set(full, { kind: 'value', q: quantity, sig: quantitySig(quantity) });
  }
  return {
    ok: true,
    bindings,
    reasons,
    output: {
      values: out,
      pointsUsed: { count: r.pointsUsed.count, times: r.pointsUsed.times.map((x) => report(q(x, tUnit))) },
      ...(r.apparent ? { note: 'after an extravascular dose, CL and Vz are apparent values, divided by the unknown bioavailability F (CL/F, Vz/F)' } : {}),
      ...(r.warnings.length ? { warnings: [...r.warnings] } : {}),
    },
  };
}
