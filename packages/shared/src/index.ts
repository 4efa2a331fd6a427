export * from './roles.js';
export * from './auth.js';
export * from './entries.js';
export * from './codes.js';
export * from './protocol.js';
export * from './live-contract.js';
export * from './effective-log.js';
