/**
 * Units: reading and writing them, and the units of a model's parameters
 * by dimensional analysis.
 *
 * @module
 */
export { formatUnit, NO_UNIT, parseUnit, type Unit } from "./unit.ts";
export { type ModelUnits, modelUnits, type ParameterUnit } from "./model_units.ts";
