/** The command-line edge: argument parsing, command registry, process wiring. */
export { runCli, nodeContext } from './main';
export type { CliContext, Command } from './context';
export * from './args';
export { activeProfile, loadProfileFile } from './profile-option';
