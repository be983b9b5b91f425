export * from './company';
export * from './auth';
export * from './sites';
export * from './estimating';
export * from './mail';
export * from './payments';
export * from './invoices';
export * from './site-visits';
