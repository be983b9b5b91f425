export * from './company';
export * from './auth';
export * from './sites';
export * from './estimating';
