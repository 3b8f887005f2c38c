/** Document → model inputs (one place; model folders never see the document). */
export * from './documentModel';
export * from './switchingCircuit';
