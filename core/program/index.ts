// Programs against time (tables, smooth ramps), CSV import and applying a program to a setup. Re-exports only.
export { TableProgram, tableProblem, sampleProgram, type Program, type ProgramPoint } from './table.ts';
export { smoothRamp, smoothRampMaxRate, type SmoothRamp } from './shapes.ts';
export { pcOf, valueOfPc, QUANTITY_UNIT, type MomentumQuantity } from './quantity.ts';
export { importProgramCsv, formatCsvIssue, type CsvProgram, type CsvIssue, type CsvQuantity, type CsvResult } from './csv.ts';
export { withMomentumProgram, withRfProgram, type ProgramData } from './apply.ts';
export { buildPrograms, programsEnd, hasRfPrograms, type CyclePrograms, type MachineEvent } from './machinePrograms.ts';
