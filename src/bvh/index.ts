export * from './take.js';
export { parseBvh, readBvhFile, type ParseOptions } from './parse.js';
export { writeBvh, type WriteOptions } from './write.js';
