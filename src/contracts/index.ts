// The contract between the client and the server (src/contracts/README.md). Pure, like the engine: no framework, no
// platform, no other part of the app.
export * from './enums';
export * from './common';
