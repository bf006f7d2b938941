// Front door of the STDF V4 reader (pure: the Node side feeds it bytes).
export { StdfReader, StdfError, looksLikeStdf, type RawRecord } from './reader';
export { StdfFrameBuilder, type StdfReport, type StdfWafer } from './frames';
export { geometryOfWcr, type WaferGeometry } from './geometry';
export { FieldCursor } from './fields';
export * from './records';
