export * from './auth';
export * from './teams';
export * from './vault';
export * from './commands';
export * from './field';
export * from './jobs';
