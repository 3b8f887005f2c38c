/** Loop analysis: crossings, margins, closed-loop stability. */
export * from './margins';
export * from './closedLoop';
export * from './analysisGrid';
export * from './slopeBounds';
