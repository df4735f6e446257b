/**
 * The web app's public surface for tests and other edges. The app itself starts from
 * main.ts (loaded by index.html); the worker from data-worker.ts. Everything here is
 * importable without a page: the DOM is touched only when a function is called.
 */
export { anyRuleForbids, inZone, layerForRule, ruleForbids, type Rule } from './rules';
export { makeDataset, type Dataset } from './dataset';
export { syntheticCif, syntheticTable } from './synthetic';
export { fromRank, runAnalysis, wilsonPoints } from './analysis-bridge';
export { MAX_PAGE_FILE_BYTES, fileTooLargeMessage } from './size-limit';
export { buildCloud, type CloudStats, type CloudStyle, type ColourMode } from './render3d/lattice-cloud';
export * from './guide';
