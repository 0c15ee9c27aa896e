export { ResultsView, type ResultsViewProps } from './results-view';
export { ResultsPreview, RunStatus, RunError, type ResultsPreviewProps } from './results-preview';
export { useSimulation, type SimulationState, type UseSimulationOptions, type SimulationSnapshot, type SimulationStatus, type SimulationError } from './use-simulation';
export { StackResults } from './stack-results';
export { CostResults } from './cost-results';
export { FormulaResults } from './formula-results';
export { CautionsList } from './cautions-list';
export { Figure, Figures, StatusMark } from './figures';
