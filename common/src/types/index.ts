export * from './roles';
export * from './user';
export * from './campaign';
export * from './audit';
export * from './mail';
export * from './recording';
export * from './run';
export * from './reading';
