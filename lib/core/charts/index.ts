// Chart geometry: pure functions (d3-array's ticks and bins), no React, usable in the browser and on the server.
export * from './axis';
export * from './format';
export * from './palette';
export * from './scene';
export * from './labels';
export * from './frame';
export * from './polyline';
export * from './spread';
export * from './cumulative';
export * from './drivers';
export * from './scatter';
export * from './ranges';
export * from './svg-string';
