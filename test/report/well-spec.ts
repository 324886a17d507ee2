/** Shared input of the report tests. */
// A single GaAs well in Al0.3Ga0.7As: small and fast; the title carries markup that must stay text.
export const WELL_SPEC = `
title: "<script>alert(1)</script> & well"
substrate: GaAs
stack:
  - { material: Al0.3Ga0.7As, thickness: 10 nm }
  - { material: GaAs, thickness: 8 nm, label: well }
  - { material: Al0.3Ga0.7As, thickness: 10 nm }
growth:
  rates: { GaAs: 1.0 µm/h, AlAs: 0.4211662 ML/s }
targets:
  - { transition: e1-hh1, wavelength: 820 nm, within: 20 nm }
`;

/** A small, coarse rectangular GaAs wire in Al0.3Ga0.7As: fast to solve. */
export const WIRE_SPEC = `
substrate: GaAs
wire:
  barrier: Al0.3Ga0.7As
  shape: { kind: rectangle, material: GaAs, width: 8 nm, height: 5 nm }
  grid: 1 nm
  margin: 4 nm
  states: 2
`;

/**
 * A bound-to-quasi-bound detector (ours, invented): 5.2 nm GaAs in Al0.26Ga0.74As at 77 K, whose
 * e2 sits about 10 meV below the barrier edge — the state a full-range band diagram hides.
 */
export const DETECTOR_SPEC = `
title: 8 µm detector well
substrate: GaAs
temperature: 77 K
stack:
  - { material: Al0.26Ga0.74As, thickness: 30 nm, label: barrier }
  - { material: GaAs, thickness: 5.2 nm, label: well }
  - { material: Al0.26Ga0.74As, thickness: 30 nm, label: barrier }
`;
