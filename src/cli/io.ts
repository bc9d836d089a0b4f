/** What a command may do with the terminal. */
export interface CliIo {
  stdout: (s: string) => void;
  stderr: (s: string) => void;
  /** Progress line on stderr when it is a terminal; an empty string clears it. */
  progress?: (s: string) => void;
}
