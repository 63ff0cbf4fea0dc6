// Request schemas (zod, pure): the server validates with them, the client types what it sends with z.input/z.infer of them.
export * from './common';
export * from './designs';
export * from './revisions';
export * from './sheets';
export * from './users';
export * from './parts';
