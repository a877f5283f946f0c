export * from './types';
export * from './time';
