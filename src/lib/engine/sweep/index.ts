/** Frequency grids. */
export * from './grid';
