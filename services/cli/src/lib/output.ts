/** Results go to stdout and everything else to stderr, so `localis whoami --json | jq` stays clean. */
export interface Output {
  out(text: string): void;
  note(text: string): void;
}

export const terminalOutput: Output = {
  out: (text) => void process.stdout.write(`${text}\n`),
  note: (text) => void process.stderr.write(`localis: ${text}\n`),
};
