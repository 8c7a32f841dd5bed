/** Ratebook's engine: the public surface. Pure TypeScript; runs in the browser and in Node. */
export { openStudy, StudySession, type EditResult, type OpenResult, type SessionOptions, type WorkStep } from './engine/session.ts';
export type { Progress } from './engine/sliced.ts';
export type { Replacement, WhatIf, WhatIfAnswer, WhatIfPrepared, WhatIfResult } from './engine/what-if.ts';
export { applyEdit, freshId, type Edit, type EditOutcome } from './study/edit.ts';
export { sameContent } from './study/same.ts';
export { solutionEdit, solutionText, type SolutionEdit } from './study/use-solution.ts';
export { splitAssignment, type Assignment } from './study/assignment.ts';
export { withEstimateParameter, defaultEstimateName, defaultGuess } from './study/estimate-rules.ts';
export { readStudy, type Problem, type ReadResult } from './study/validate.ts';
export type { Study, Cell, CellKind, PlotScale, SolveCell, FitPrior, FitErrorModel, ParameterItem, ParameterSpread } from './study/types.ts';
export type { SensitivityCell, CompareCell, CompareScenario } from './study/types.ts';
export type { SensitivityEntry, SensitivityFields, CompareFields, ComparePlot, CompareScenarioReport } from './engine/report-scenarios.ts';
export { CELL_KINDS, CURRENT_VERSION, FORMAT, PLOT_SCALES } from './study/types.ts';
export { FIND_KINDS, findKindOf, needsLevel, switchFind, withFindState, withFindUnit, withFindField, freshFindName, type FindKind, type FindOption, type FindQuery } from './study/find-rules.ts';
export { EVENT_ACTIONS, eventActionOf, eventTarget, withTarget, eventTargets, withTargetAt, withoutTargetAt, switchAction, withEventField, type EventAction, type ScheduleEvent } from './study/event-rules.ts';
export type {
  Report, CellReport, ReportOf, ReportBase, ReportQuantity, CellFields, ParameterValue, PhaseEquilibrium, PhaseInterval,
  PhasePlotData, SweepReport, SimulationPlot, FindResult, NotReached, ClosedFormReport, EstimateReport, FitResidual, CsvReadReport,
} from './engine/report.ts';
export type { Histogram, UncertaintyResult, PercentilePrecision, UncertainInput, SpreadReport, UncertaintyBand } from './engine/report.ts';
export { runBand, type RunBand, type DrawnBand } from './output/run-band.ts';
export { MAX_SAMPLES } from './study/types.ts';
export { isKind } from './engine/report.ts';
export type { GlanceEntry, GlanceKind } from './output/glance.ts';
export type { CellError, ProblemKind, MessagePart } from './engine/node.ts';
export { parseExpression, type ParseResult, type ExprProblem } from './expression/parse.ts';
export { evaluateExpression, type Lookup, type Value } from './expression/evaluate.ts';
export { compileExpression, type Compiled } from './expression/compile.ts';
export { type Quantity, report as reportQuantity, describe as describeQuantity, formatNumber } from './units/quantity.ts';
export { FUNCTION_NAMES } from './expression/functions.ts';
export { runStudy, exitCodeOf } from './engine/run.ts';
export { tableFromCsv } from './cells/data.ts';
export type { CsvRead, CsvColumn, CsvRowProblem, DeclaredColumn } from './csv/read.ts';
export { readCsvTable } from './csv/read.ts';
export { type ToCsvWorker, type FromCsvWorker, PASTE_ROW_LIMIT, roughRowCount } from './csv/worker-messages.ts';
export type { ItemTex } from './output/sheet-tex.ts';
export { unitChoicesFor, timeAxisUnits, TRADE_UNITS, type AxisUnit } from './output/display-units.ts';
export { nameTex } from './expression/tex.ts';
export type { FromWorker, ToWorker } from './engine/worker-protocol.ts';
export { residualColumns, residualsFromColumns, residualBuffers, lazyResiduals, type ResidualColumns } from './output/residual-columns.ts';
export { lookupUnit, unitAfterNumber } from './units/units.ts';
export { prepareMathjs } from './units/mathjs.ts';
export { commonUnitNames, constantNames, functionNames, unitNames } from './expression/vocabulary.ts';
export { fieldWords, cellWords, KIND_LABELS } from './output/field-words.ts';
export { problemWords, partsWords, waitWords, waitedOn, type ReportsOf } from './output/problem-words.ts';
export { inspectorNotes, residualSdReason } from './output/sheet-notes.ts';
export { fieldReadsStates } from './cells/reads-states.ts';
export { UNCERTAINTY_ENDINGS } from './cells/fit-uncertainty.ts';
