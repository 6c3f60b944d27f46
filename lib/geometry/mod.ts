/** geometry concern barrel: re-exports only. @module */
export {};
