/** Where a command writes its text; tests pass collectors. */
export interface CommandIo {
  stdout(text: string): void;
  stderr(text: string): void;
}
