export * from './frame-times';
export * from './sync';
export * from './timecode';
