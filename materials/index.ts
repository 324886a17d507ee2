/**
 * Public API of the materials layer.
 */
export { BINARIES, BINARY_SOURCES, binaryOf, type BinaryName } from './binaries.js';
export { TERNARIES, supportIssue } from './ternaries.js';
export { alloyParams, alloyAt, type AlloyAtT, type AlloyParams } from './alloys.js';
export { GROUP_III, GROUP_V, alloyFromName, formatFormula, formatFraction, parseFormula, validateAlloy } from './formula.js';
export { LATTICE_HOLD_K, boseEinstein, gapAt, gapsAt, latticeAt, varshni } from './temperature.js';
export { biaxialStrain, criticalThickness, edgeShifts, lightHoleShift, type BiaxialStrain, type EdgeShifts } from './strain.js';
export { electronMassAtGap, holeMasses, kaneInverseMass, type HoleMasses } from './masses.js';
export { nonparabolicity, type NonparabolicityInput, type NonparabolicityModel } from './nonparabolicity.js';
export { DEFAULT_MODELS, customMaterial, resolveMaterial, type CustomMaterialDef } from './resolve.js';
export type { Alloy, BinaryParams, ElectronMassModel, GapLaw, LatticeModel, MaterialModels, ResolvedMaterial } from './types.js';
export { NAMED_GAP_TEMPERATURE_K, latticeMatchedByWavelength, parseMaterialName } from './quaternary.js';
export { balancingThickness, biaxialStiffness, netStrain, worstStrainRun, zeroStressLattice, type StrainLayer, type StrainRun } from './strain-balance.js';
