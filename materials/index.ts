/**
 * Public API of the materials layer.
 */
export { BINARIES, BINARY_SOURCES, binaryOf, type BinaryName } from './binaries.js';
export { TERNARIES, supportIssue } from './ternaries.js';
export { alloyParams, alloyAt, type AlloyAtT } from './alloys.js';
export { GROUP_III, GROUP_V, alloyFromName, formatFormula, formatFraction, parseFormula, validateAlloy, type Alloy } from './formula.js';
export { gapsAt, latticeAt, varshni } from './temperature.js';
export { biaxialStrain, criticalThickness, edgeShifts, lightHoleShift, type BiaxialStrain, type EdgeShifts } from './strain.js';
export { holeMasses, type HoleMasses } from './masses.js';
export { customMaterial, resolveMaterial, type CustomMaterialDef } from './resolve.js';
export type { BinaryParams, ResolvedMaterial } from './types.js';
