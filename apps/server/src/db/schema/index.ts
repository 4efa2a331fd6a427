export * from './users.js';
export * from './audit.js';
export * from './places.js';
export * from './codes.js';
export * from './records.js';
export * from './pharmacy.js';
export * from './quality.js';
export * from './admin.js';
