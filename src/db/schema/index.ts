export * from './auth';
export * from './teams';
