// Presentation shared by the chairside island and the server-rendered pages: pure, no I/O,
// no React. Import the file you need (labels, format, events, findings) to keep bundles small.
export * from './labels';
export * from './format';
export * from './events';
export * from './findings';
export * from './review';
