/** Scheme stability (von Neumann analysis): the public surface used by the audit, the CLI and the view. */
export { analyseScheme, courantLimit, THETA_SAMPLES, type SchemeResult } from './courant.js';
export { SPACE_OPERATORS, spaceOperator, type SpaceOperator } from './operators.js';
export { TIME_INTEGRATORS, builtInTableau, parseTableau, validateTableau, type Tableau } from './tableau.js';
export { stabilityPolynomial, realInterval, imagInterval, STABILITY_TOLERANCE } from './polynomial.js';
export { stabilityBoundary } from './region.js';
export { stabilitySvg, type SvgOptions } from './svg.js';
