// Chart geometry: pure functions (d3-scale, d3-array, d3-shape), no React, usable in the browser and on the server.
export * from './axis';
export * from './format';
export * from './palette';
export * from './scene';
export * from './labels';
export * from './frame';
export * from './spread';
export * from './cumulative';
export * from './drivers';
export * from './scatter';
export * from './ranges';
export * from './svg-string';
