/**
 * What a command may touch: its output streams. Commands write through this,
 * so tests can run them in-process and capture output.
 */
export interface CliContext {
  out(text: string): void;
  err(text: string): void;
  /** True when stderr is a terminal (progress is shown only then). */
  readonly interactive: boolean;
  /** Working directory for relative paths. */
  readonly cwd: string;
  /** Lab profile given with --profile (set by the dispatcher); read it with activeProfile(ctx). */
  readonly profile?: import('../profile').LabProfile;
}

export interface Command {
  readonly spec: import('./args').CommandSpec;
  run(argv: readonly string[], ctx: CliContext): Promise<number>;
}
