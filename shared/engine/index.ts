// Public surface of the discharge engine: pure functions, SI units, no I/O.
export { ENGINE_VERSION, computeDischarge, completeInput, type CompleteInput, type DischargeRequest } from './compute';
export {
  busFromMains,
  capacitorMaxUnit,
  capacitorMinUnit,
  capacitorNetwork,
  maxContinuousVoltage,
  networkCorners,
  parallelCapacitance,
  parallelResistance,
  resistorMaxCorner,
  resistorMinCorner,
  resistorNetwork,
  seriesCapacitance,
  seriesResistance,
  tcrFactor,
  type NetworkCorners,
  type ResistorCorner,
} from './network';
export {
  maxDischargeResistance,
  minDischargeCurrent,
  pathTime,
  pathVoltage,
  rcTime,
  rcVoltage,
  safeThreshold,
  storedCharge,
  storedEnergy,
  type Criterion,
  type DischargePath,
  type SafeThreshold,
} from './decay';
export { balancingBound, worstCapacitorVoltage } from './balancing';
export { scenario, worstCaseTime, type Corner, type Scenario } from './scenario';
export { dischargeCurve, CHART_TOLERANCE, CURVE_MAX_POINTS, type CurveResolution } from './curve';
export { sensitivity } from './sensitivity';
export { suggestBleeder, SUGGEST_MAX_PARALLEL, SUGGEST_MAX_RESISTANCE, SUGGEST_MAX_SERIES, type SuggestDesign } from './suggest';
export { eSeriesMantissas, eValueAbove, eValueAtOrBelow, type ESeries } from './e-series';
export { spiceNetlist, SPICE_BUS_NODE, SPICE_MEASURE } from './spice';
