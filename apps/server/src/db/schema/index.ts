export * from './users.js';
export * from './audit.js';
export * from './places.js';
export * from './codes.js';
export * from './records.js';
