/** Core types shared by every layer: the reflection table, cell parameters, input errors. */
export * from './errors';
export * from './cell';
export * from './reflection-table';
