/** Charts built once (d3 scales to SVG strings) and shared by the HTML report and the workbench. */
export * from './svg';
export * from './palette';
export * from './format';
export * from './stacked';
export * from './bars';
export * from './quadrant';
export * from './tornado';
export * from './histogram';
export * from './heatmap';
export * from './bands';
export * from './labels';
export * from './parts';
