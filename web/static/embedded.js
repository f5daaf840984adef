// What a single-file page carries inside itself: null for the page served as
// a folder. web/build-single.mjs replaces this module with one that holds
// the index, the Wasm and the worker.
export const embedded = null;
