/**
 * The experimental statistics Foldfolio reads (never computes) from an uploaded file, with the
 * PDBx/mmCIF items (open standard; dictionary: Debian libcifpp-data mmcif_pdbx.dic) and the
 * legacy PDB REMARK lines each one comes from. Keys are our own names, units in the name.
 */

export type ExperimentMethod = 'x-ray' | 'electron-microscopy' | 'nmr' | 'neutron' | 'unknown';

/** Where a field is read: PDBx items in order of preference (category.item, no leading underscore). */
export interface ExperimentFieldDef {
  key: string;
  label: string;
  kind: 'number' | 'string';
  /** candidate PDBx items, first present one wins */
  items: string[];
  /** read from the highest-resolution row of this looped category instead of row 0 */
  shell?: boolean;
  /** only meaningful for these methods (undefined: any) */
  methods?: ExperimentMethod[];
}

const X: ExperimentMethod[] = ['x-ray', 'neutron'];
const EM: ExperimentMethod[] = ['electron-microscopy'];
const NMR: ExperimentMethod[] = ['nmr'];

export const EXPERIMENT_FIELDS: readonly ExperimentFieldDef[] = [
  // crystal
  {
    key: 'spaceGroup',
    label: 'Space group',
    kind: 'string',
    items: ['symmetry.space_group_name_H-M', 'space_group.name_H-M_alt'],
    methods: X,
  },
  { key: 'cellA', label: 'a (Å)', kind: 'number', items: ['cell.length_a'], methods: X },
  { key: 'cellB', label: 'b (Å)', kind: 'number', items: ['cell.length_b'], methods: X },
  { key: 'cellC', label: 'c (Å)', kind: 'number', items: ['cell.length_c'], methods: X },
  { key: 'cellAlpha', label: 'α (°)', kind: 'number', items: ['cell.angle_alpha'], methods: X },
  { key: 'cellBeta', label: 'β (°)', kind: 'number', items: ['cell.angle_beta'], methods: X },
  { key: 'cellGamma', label: 'γ (°)', kind: 'number', items: ['cell.angle_gamma'], methods: X },
  // data collection
  {
    key: 'wavelengthA',
    label: 'Wavelength (Å)',
    kind: 'string',
    items: [
      'diffrn_source.pdbx_wavelength_list',
      'diffrn_source.pdbx_wavelength',
      'diffrn_radiation_wavelength.wavelength',
    ],
    methods: X,
  },
  {
    key: 'beamline',
    label: 'Source',
    kind: 'string',
    items: ['diffrn_source.type', 'diffrn_source.source'],
    methods: X,
  },
  {
    key: 'resolutionLowA',
    label: 'Resolution low (Å)',
    kind: 'number',
    items: ['reflns.d_resolution_low'],
    methods: X,
  },
  {
    key: 'resolutionHighA',
    label: 'Resolution high (Å)',
    kind: 'number',
    items: ['reflns.d_resolution_high'],
    methods: X,
  },
  {
    key: 'shellResolutionLowA',
    label: 'Highest shell low (Å)',
    kind: 'number',
    items: ['reflns_shell.d_res_low'],
    shell: true,
    methods: X,
  },
  {
    key: 'shellResolutionHighA',
    label: 'Highest shell high (Å)',
    kind: 'number',
    items: ['reflns_shell.d_res_high'],
    shell: true,
    methods: X,
  },
  {
    key: 'reflectionsUnique',
    label: 'Unique reflections',
    kind: 'number',
    items: ['reflns.number_obs'],
    methods: X,
  },
  {
    key: 'shellReflectionsUnique',
    label: 'Unique reflections, highest shell',
    kind: 'number',
    items: ['reflns_shell.number_unique_obs', 'reflns_shell.number_unique_all'],
    shell: true,
    methods: X,
  },
  {
    key: 'completenessPct',
    label: 'Completeness (%)',
    kind: 'number',
    items: ['reflns.percent_possible_obs'],
    methods: X,
  },
  {
    key: 'shellCompletenessPct',
    label: 'Completeness, highest shell (%)',
    kind: 'number',
    items: ['reflns_shell.percent_possible_all', 'reflns_shell.percent_possible_obs'],
    shell: true,
    methods: X,
  },
  {
    key: 'multiplicity',
    label: 'Multiplicity',
    kind: 'number',
    items: ['reflns.pdbx_redundancy'],
    methods: X,
  },
  {
    key: 'shellMultiplicity',
    label: 'Multiplicity, highest shell',
    kind: 'number',
    items: ['reflns_shell.pdbx_redundancy'],
    shell: true,
    methods: X,
  },
  {
    key: 'iOverSigma',
    label: 'Mean I/σ(I)',
    kind: 'number',
    items: ['reflns.pdbx_netI_over_sigmaI'],
    methods: X,
  },
  {
    key: 'shellIOverSigma',
    label: 'Mean I/σ(I), highest shell',
    kind: 'number',
    items: ['reflns_shell.meanI_over_sigI_obs', 'reflns_shell.pdbx_netI_over_sigmaI_obs'],
    shell: true,
    methods: X,
  },
  {
    key: 'rMerge',
    label: 'Rmerge',
    kind: 'number',
    items: ['reflns.pdbx_Rmerge_I_obs', 'reflns.pdbx_Rsym_value'],
    methods: X,
  },
  {
    key: 'shellRMerge',
    label: 'Rmerge, highest shell',
    kind: 'number',
    items: ['reflns_shell.Rmerge_I_obs', 'reflns_shell.pdbx_Rsym_value'],
    shell: true,
    methods: X,
  },
  { key: 'ccHalf', label: 'CC1/2', kind: 'number', items: ['reflns.pdbx_CC_half'], methods: X },
  {
    key: 'shellCcHalf',
    label: 'CC1/2, highest shell',
    kind: 'number',
    items: ['reflns_shell.pdbx_CC_half'],
    shell: true,
    methods: X,
  },
  {
    key: 'wilsonB',
    label: 'Wilson B (Å²)',
    kind: 'number',
    items: ['reflns.B_iso_Wilson_estimate'],
    methods: X,
  },
  // refinement
  {
    key: 'refineResolutionLowA',
    label: 'Refinement resolution low (Å)',
    kind: 'number',
    items: ['refine.ls_d_res_low'],
    methods: X,
  },
  {
    key: 'refineResolutionHighA',
    label: 'Refinement resolution high (Å)',
    kind: 'number',
    items: ['refine.ls_d_res_high'],
    methods: X,
  },
  {
    key: 'reflectionsRefinement',
    label: 'Reflections used in refinement',
    kind: 'number',
    items: ['refine.ls_number_reflns_obs'],
    methods: X,
  },
  {
    key: 'reflectionsFree',
    label: 'Reflections in the test set',
    kind: 'number',
    items: ['refine.ls_number_reflns_R_free'],
    methods: X,
  },
  {
    key: 'refineCompletenessPct',
    label: 'Refinement completeness (%)',
    kind: 'number',
    items: ['refine.ls_percent_reflns_obs'],
    methods: X,
  },
  {
    key: 'rWork',
    label: 'R-work',
    kind: 'number',
    items: ['refine.ls_R_factor_R_work', 'refine.ls_R_factor_obs'],
    methods: X,
  },
  {
    key: 'rFree',
    label: 'R-free',
    kind: 'number',
    items: ['refine.ls_R_factor_R_free'],
    methods: X,
  },
  {
    key: 'bMeanRefined',
    label: 'Mean B (Å²), as deposited',
    kind: 'number',
    items: ['refine.B_iso_mean'],
    methods: X,
  },
  // cryo-EM
  {
    key: 'emMicroscope',
    label: 'Microscope',
    kind: 'string',
    items: ['em_imaging.microscope_model'],
    methods: EM,
  },
  {
    key: 'emVoltageKv',
    label: 'Voltage (kV)',
    kind: 'number',
    items: ['em_imaging.accelerating_voltage'],
    methods: EM,
  },
  {
    key: 'emDetector',
    label: 'Detector',
    kind: 'string',
    items: ['em_image_recording.film_or_detector_model'],
    methods: EM,
  },
  {
    key: 'emDosePerA2',
    label: 'Electron exposure (e⁻/Å²)',
    kind: 'number',
    items: ['em_image_recording.avg_electron_dose_per_image'],
    methods: EM,
  },
  {
    key: 'emDefocusMinNm',
    label: 'Defocus min (nm)',
    kind: 'number',
    items: ['em_imaging.nominal_defocus_min'],
    methods: EM,
  },
  {
    key: 'emDefocusMaxNm',
    label: 'Defocus max (nm)',
    kind: 'number',
    items: ['em_imaging.nominal_defocus_max'],
    methods: EM,
  },
  {
    key: 'emPixelSizeA',
    label: 'Pixel size (Å)',
    kind: 'number',
    items: ['em_3d_reconstruction.actual_pixel_size', 'em_3d_reconstruction.nominal_pixel_size'],
    methods: EM,
  },
  {
    key: 'emSymmetry',
    label: 'Symmetry imposed',
    kind: 'string',
    items: ['em_3d_reconstruction.symmetry_type', 'em_single_particle_entity.point_symmetry'],
    methods: EM,
  },
  {
    key: 'emParticles',
    label: 'Final particle images',
    kind: 'number',
    items: ['em_3d_reconstruction.num_particles'],
    methods: EM,
  },
  {
    key: 'emResolutionA',
    label: 'Map resolution (Å)',
    kind: 'number',
    items: ['em_3d_reconstruction.resolution'],
    methods: EM,
  },
  {
    key: 'emResolutionMethod',
    label: 'Resolution criterion',
    kind: 'string',
    items: ['em_3d_reconstruction.resolution_method'],
    methods: EM,
  },
  // NMR
  {
    key: 'nmrConformersCalculated',
    label: 'Conformers calculated',
    kind: 'number',
    items: ['pdbx_nmr_ensemble.conformers_calculated_total_number'],
    methods: NMR,
  },
  {
    key: 'nmrConformersSubmitted',
    label: 'Conformers submitted',
    kind: 'number',
    items: ['pdbx_nmr_ensemble.conformers_submitted_total_number'],
    methods: NMR,
  },
  {
    key: 'nmrSelection',
    label: 'Selection criterion',
    kind: 'string',
    items: ['pdbx_nmr_ensemble.conformer_selection_criteria'],
    methods: NMR,
  },
  {
    key: 'nmrRefinementMethod',
    label: 'Refinement method',
    kind: 'string',
    items: ['pdbx_nmr_refine.method'],
    methods: NMR,
  },
  {
    key: 'nmrTemperatureK',
    label: 'Temperature (K)',
    kind: 'number',
    items: ['pdbx_nmr_exptl_sample_conditions.temperature'],
    methods: NMR,
  },
  {
    key: 'nmrPH',
    label: 'pH',
    kind: 'number',
    items: ['pdbx_nmr_exptl_sample_conditions.pH'],
    methods: NMR,
  },
  {
    key: 'nmrSpectrometer',
    label: 'Spectrometer',
    kind: 'string',
    items: ['pdbx_nmr_spectrometer.manufacturer'],
    methods: NMR,
  },
  {
    key: 'nmrFieldMHz',
    label: 'Field strength (MHz)',
    kind: 'number',
    items: ['pdbx_nmr_spectrometer.field_strength'],
    methods: NMR,
  },
  {
    key: 'nmrMaxDistanceViolationA',
    label: 'Max distance-restraint violation (Å)',
    kind: 'number',
    items: ['pdbx_nmr_ensemble.maximum_distance_constraint_violation'],
    methods: NMR,
  },
  {
    key: 'nmrMaxTorsionViolationDeg',
    label: 'Max torsion-restraint violation (°)',
    kind: 'number',
    items: ['pdbx_nmr_ensemble.maximum_torsion_angle_constraint_violation'],
    methods: NMR,
  },
  // any method
  {
    key: 'refinementProgram',
    label: 'Refinement program',
    kind: 'string',
    items: ['computing.structure_refinement'],
  },
];

/** Every PDBx item the reader looks at (tests check each exists in the dictionary). */
export function experimentItemNames(): string[] {
  const names = new Set<string>(['exptl.method']);
  for (const f of EXPERIMENT_FIELDS) for (const i of f.items) names.add(i);
  names.add('software.name');
  names.add('software.classification');
  return [...names].sort();
}

export function experimentField(key: string): ExperimentFieldDef | undefined {
  return EXPERIMENT_FIELDS.find((f) => f.key === key);
}
