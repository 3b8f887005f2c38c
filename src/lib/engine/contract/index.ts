/** The JSON contract (v1): design-document and analysis-response schemas, the error shape. */
export * from './designSchema';
export * from './responseSchema';
export * from './errors';
export * from './robustnessSchema';
export * from './targetsSchema';
