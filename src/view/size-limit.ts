/**
 * The page refuses reflection files larger than it can hold, with a message,
 * instead of freezing the tab. The worker keeps the file's bytes and the table
 * (14 bytes per reflection) side by side, and the lattice view draws every
 * reflection. Measured in headless Chromium on 2 cores: 20 million unmerged rows
 * (394 MB) load and are analysed in about 22 s with the page responsive
 * throughout; 512 MB (about 26 million rows) keeps a margin below the 2-4 GB a
 * tab may use. The command line has no such limit.
 */
export const MAX_PAGE_FILE_BYTES = 512 * 1024 * 1024;

function megabytes(bytes: number): string {
  return `${(bytes / (1024 * 1024)).toFixed(0)} MB`;
}

/** The refusal for a file of `bytes` (after unpacking), or undefined when it fits. */
export function fileTooLargeMessage(name: string, bytes: number, unpacked = false): string | undefined {
  if (bytes <= MAX_PAGE_FILE_BYTES) return undefined;
  return `${name} is ${unpacked ? 'more than ' : ''}${megabytes(bytes)}${unpacked ? ' when unpacked' : ''}: the page opens reflection files up to ${megabytes(MAX_PAGE_FILE_BYTES)}. ` +
    'Use the command line for it (npx lacuna inspect FILE, npx lacuna rank FILE), or merge the observations first.';
}
