// The contract between the client and the server (src/contracts/README.md). Pure, like the engine: no framework, no
// platform, nothing of the app but the engine and the formatting layer (and zod, for the request schemas).
export * from './enums';
export * from './common';
export * from './users';
export * from './designs';
export * from './revisions';
export * from './sheets';
export * from './measurements';
export * from './attachments';
export * from './parts';
export * from './system';
export * from './requests';
