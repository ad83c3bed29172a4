/** Files we define: projects, scenarios (browser-safe; no file system here). */
export * from './json';
export * from './check';
export * from './scenarios';
export * from './project';
