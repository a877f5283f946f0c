export * from './types';
export * from './time';
export * from './readings';
export * from './export';
// units/ and analysis/ are imported by path (common/src/analysis, common/src/units) rather than
// re-exported here: they bring mathjs and jstat, which the web app's every page would otherwise load.
