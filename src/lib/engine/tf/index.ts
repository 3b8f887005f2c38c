/** Factored transfer functions: types, algebra, evaluation, conversions (see types.ts). */
export * from './types';
export * from './algebra';
export * from './evaluate';
export * from './convert';
