export * from './checksum';
export * from './line-reader';
export * from './messages';
export * from './decoder';
export * from './check-plan';
