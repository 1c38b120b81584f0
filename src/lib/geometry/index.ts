/** The fit engine: pure TypeScript, no framework, DOM or Node imports. */
export * from './schema';
export * from './types';
export * from './box';
export * from './positions';
export * from './errors';
