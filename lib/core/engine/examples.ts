/**
 * One complete example model per template. The scenarios and numbers are invented for
 * documentation and tests; they describe no real product, site or company.
 */
import type { StochosModelInput, Template } from './schema';

/** Axial float of a gearbox output shaft between its two bearings (mm). */
export const exampleLinearStack = {
  schema: 'stochos.model/1',
  template: 'linear-stack',
  title: 'Gearbox output shaft: bearing axial float',
  description:
    'Axial clearance left between the cover spigot and the outer race of bearing B when the shaft, two bearings and the spacer sleeve are assembled into the housing. Required float 0.05 to 0.40 mm.',
  unit: 'mm',
  settings: { trials: 50_000, seed: 'gearbox-float-demo', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
  contributors: [
    { id: 'housing_depth', name: 'Housing bore depth, shoulder to face', nominal: 62.0, plusTol: 0.05, minusTol: 0.05, direction: 1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'gasket', name: 'Cover gasket, compressed thickness', nominal: 0.25, plusTol: 0.04, minusTol: 0.04, direction: 1, distribution: { type: 'triangular' }, meanShift: 0 },
    { id: 'cover_spigot', name: 'Cover spigot height', nominal: 4.0, plusTol: 0.03, minusTol: 0.03, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'bearing_a', name: 'Bearing A width', nominal: 17.0, plusTol: 0, minusTol: 0.12, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    {
      id: 'bearing_b',
      name: 'Bearing B width (measured batch)',
      nominal: 17.0,
      plusTol: 0,
      minusTol: 0.12,
      direction: -1,
      distribution: {
        type: 'empirical',
        data: [
          16.952, 16.941, 16.963, 16.947, 16.958, 16.936, 16.944, 16.961, 16.949, 16.955, 16.939, 16.966, 16.951, 16.945, 16.957, 16.942, 16.953, 16.948,
          16.96, 16.946, 16.954, 16.94, 16.95, 16.959,
        ],
      },
      meanShift: 0,
    },
    { id: 'spacer', name: 'Spacer sleeve length', nominal: 24.15, plusTol: 0.05, minusTol: 0.05, direction: -1, distribution: { type: 'uniform' }, meanShift: 0 },
  ],
  limits: { lower: 0.05, upper: 0.4 },
  dials: [
    { id: 'spacer_length', label: 'Spacer sleeve length', unit: 'mm', min: 24.05, max: 24.25, step: 0.01, default: 24.15, target: { kind: 'input-param', inputId: 'spacer', param: 'nominal' } },
    { id: 'housing_k', label: 'Housing process: sigmas per tolerance', unit: 'σ', min: 2, max: 4, step: 0.5, default: 3, target: { kind: 'input-param', inputId: 'housing_depth', param: 'k' } },
    { id: 'float_max', label: 'Maximum allowed float', unit: 'mm', min: 0.3, max: 0.5, step: 0.01, default: 0.4, target: { kind: 'limit', which: 'upper' } },
  ],
} satisfies StochosModelInput;

/** Refurbishment of a small steel footbridge (thousand EUR). */
export const exampleCostRange = {
  schema: 'stochos.model/1',
  template: 'cost-range',
  title: 'Footbridge refurbishment: Hollin Beck crossing',
  description: 'Blast cleaning, steel repairs and repainting of a 42 m steel truss footbridge, with deck resurfacing and bearing replacement. Figures in thousand EUR.',
  currency: 'kEUR',
  settings: { trials: 20_000, seed: 'footbridge-demo', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
  items: [
    { id: 'site_setup', name: 'Site set-up and welfare', low: 38, mostLikely: 42, high: 55, distribution: 'pert' },
    { id: 'traffic_mgmt', name: 'Traffic and pedestrian management', low: 22, mostLikely: 25, high: 34, distribution: 'pert' },
    { id: 'scaffold', name: 'Scaffolding and encapsulation', low: 85, mostLikely: 96, high: 130, distribution: 'pert' },
    { id: 'blast', name: 'Blast cleaning of steelwork', low: 60, mostLikely: 70, high: 98, distribution: 'pert' },
    { id: 'steel_repair', name: 'Steel repairs (plates and bolts)', low: 45, mostLikely: 62, high: 120, distribution: 'pert' },
    { id: 'coating', name: 'Three-coat paint system', low: 72, mostLikely: 80, high: 104, distribution: 'pert' },
    { id: 'deck', name: 'Deck surfacing renewal', low: 40, mostLikely: 46, high: 60, distribution: 'pert' },
    { id: 'bearings', name: 'Bearing replacement', low: 28, mostLikely: 34, high: 52, distribution: 'triangular' },
    { id: 'drainage', name: 'Drainage and expansion joints', low: 12, mostLikely: 15, high: 22, distribution: 'pert' },
    { id: 'design_fees', name: 'Design and site supervision', low: 48, mostLikely: 52, high: 60, distribution: 'uniform' },
  ],
  correlationGroups: [
    { id: 'surface_works', name: 'Surface works share crews and access', items: ['scaffold', 'blast', 'steel_repair', 'coating'], rho: 0.4 },
    { id: 'prelims', name: 'Preliminaries', items: ['site_setup', 'traffic_mgmt'], rho: 0.3 },
  ],
  riskEvents: [
    { id: 'lead_paint', name: 'Lead found in the existing paint', probability: 0.3, impact: { low: 25, mostLikely: 40, high: 70, distribution: 'pert' } },
    { id: 'weather', name: 'Weather delays to coating', probability: 0.4, impact: { low: 8, mostLikely: 15, high: 30, distribution: 'triangular' } },
    { id: 'section_loss', name: 'Section loss beyond the survey', probability: 0.2, impact: { low: 30, mostLikely: 55, high: 110, distribution: 'pert' } },
    { id: 'utility', name: 'Utility diversion required', probability: 0.1, impact: { low: 15, mostLikely: 20, high: 45, distribution: 'pert' } },
  ],
  baseEstimate: 522,
  budget: 600,
  confidence: 0.8,
  dials: [
    { id: 'budget_dial', label: 'Budget', unit: 'kEUR', min: 540, max: 720, step: 5, default: 600, target: { kind: 'budget' } },
    { id: 'confidence_dial', label: 'Confidence for contingency', unit: '', min: 0.5, max: 0.95, step: 0.05, default: 0.8, target: { kind: 'confidence' } },
    { id: 'lead_paint_p', label: 'Chance of lead paint', unit: '', min: 0, max: 1, step: 0.05, default: 0.3, target: { kind: 'input-param', inputId: 'lead_paint', param: 'probability' } },
    { id: 'surface_rho', label: 'Correlation of surface works', unit: '', min: 0, max: 0.8, step: 0.1, default: 0.4, target: { kind: 'group-correlation', groupId: 'surface_works' } },
  ],
} satisfies StochosModelInput;

/** Electrical load of a booster pump (kW). */
export const exampleFormula = {
  schema: 'stochos.model/1',
  template: 'formula',
  title: 'Booster pump: motor load',
  description: 'Motor input power of a water booster pump from duty flow, head, pump and motor efficiency. The motor is rated 37 kW.',
  settings: { trials: 20_000, seed: 'pump-load-demo', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
  inputs: [
    { id: 'flow', name: 'Duty flow', unit: 'm³/s', distribution: { type: 'normal', mean: 0.05, sd: 0.004, min: 0.035, max: 0.065 } },
    { id: 'head', name: 'Total head', unit: 'm', distribution: { type: 'triangular', min: 38, mode: 42, max: 50 } },
    { id: 'pump_eff', name: 'Pump efficiency', unit: '', distribution: { type: 'pert', min: 0.68, mode: 0.74, max: 0.78 } },
    { id: 'density', name: 'Water density', unit: 'kg/m³', distribution: { type: 'uniform', min: 996, max: 1000 } },
    {
      id: 'motor_eff',
      name: 'Motor efficiency (from test sheets)',
      unit: '',
      distribution: {
        type: 'drawn',
        points: [
          { x: 0.9, y: 0 },
          { x: 0.93, y: 2 },
          { x: 0.95, y: 3 },
          { x: 0.96, y: 0 },
        ],
      },
    },
  ],
  correlation: {
    inputs: ['flow', 'head'],
    matrix: [
      [1, -0.5],
      [-0.5, 1],
    ],
  },
  outputs: [
    { id: 'hydraulic_kw', name: 'Hydraulic power', unit: 'kW', formula: 'density * 9.80665 * flow * head / 1000' },
    { id: 'shaft_kw', name: 'Pump shaft power', unit: 'kW', formula: 'hydraulic_kw / pump_eff' },
    { id: 'motor_kw', name: 'Motor input power', unit: 'kW', formula: 'shaft_kw / motor_eff * service_factor', upper: 37 },
  ],
  dials: [
    { id: 'service_factor', label: 'Service factor', unit: '', min: 1, max: 1.25, step: 0.05, default: 1.1, target: { kind: 'variable' } },
    { id: 'flow_mean', label: 'Mean duty flow', unit: 'm³/s', min: 0.04, max: 0.06, step: 0.001, default: 0.05, target: { kind: 'input-param', inputId: 'flow', param: 'mean' } },
    { id: 'motor_rating', label: 'Motor rating', unit: 'kW', min: 30, max: 45, step: 1, default: 37, target: { kind: 'limit', which: 'upper', outputId: 'motor_kw' } },
  ],
} satisfies StochosModelInput;

export const EXAMPLE_MODELS: Record<Template, StochosModelInput> = {
  'linear-stack': exampleLinearStack,
  'cost-range': exampleCostRange,
  formula: exampleFormula,
};
