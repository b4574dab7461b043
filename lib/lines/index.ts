export * from './fields';
export * from './mapping';
export * from './parse';
export * from './validate';
export * from './diff';
export * from './design-basis';
export * from './solve-line';
