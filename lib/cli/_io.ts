/** Where a command writes its text; tests pass collectors. */
export interface CommandIo {
  stdout(text: string): void;
  stderr(text: string): void;
  /** Whether stdout is a terminal (live progress bars). @default false */
  isTerminal?(): boolean;
}
