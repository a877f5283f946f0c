export * from './types';
export * from './time';
export * from './readings';
