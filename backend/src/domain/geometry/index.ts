// The cage model's geometry: pure functions on plain { x, y, z } millimetre vectors (docs/geometry.md).
export * from './vec.js';
export * from './model.js';
export * from './member-path.js';
export * from './centreline.js';
export * from './names.js';
export * from './derive.js';
export * from './derived-facts.js';
export * from './mirror.js';
export * from './starting-shapes.js';
