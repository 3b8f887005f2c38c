/** Polynomials (ascending coefficients), complex values, polynomial roots. */
export * from './complex';
export * from './polynomial';
export * from './roots';
export * from './scalarRoot';
export * from './displayRounding';
