export * from './auth';
export * from './teams';
export * from './vault';
