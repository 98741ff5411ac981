/** The profile page lists each token by its first 10 characters (`lcs_` and 6 more): show the same. */
const SHOWN = 10;

/**
 * How a token appears in any output: its first 10 characters and an ellipsis, never more. Something
 * too short to be a real token (a paste gone wrong) shows at most half of itself, so the mask never
 * prints a whole secret.
 */
export function maskToken(token: string): string {
  return `${token.slice(0, Math.min(SHOWN, Math.floor(token.length / 2)))}…`;
}
